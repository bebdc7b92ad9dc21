/* ow_version.h - the version of opwin, which the command prints and the
 * reports carry. Includes nothing. */
#ifndef OW_VERSION_H
#define OW_VERSION_H

#define OW_VERSION "0.1.0"

#endif
