/* ow_version.h - the version of libopwin and the opwin command, printed
 * by --version and written into every document opwin makes. */
#ifndef OW_VERSION_H
#define OW_VERSION_H

#define OW_VERSION "0.1.0"

#endif
