/* ow_io.h - the file layer under every module that reads or writes files:
 * a growable byte buffer, a whole-file reader that never blocks on a FIFO
 * and refuses what is not a regular file, an atomic file writer, a folder
 * written as a whole (a sibling temporary folder renamed into place), and
 * CRC-32. It uses nothing of opwin but ow_status.
 *
 * Writing a file. ow_io_write_file never opens a predictable name: the
 * temporary is created with mkstemp (O_EXCL, so a symbolic link planted in
 * the folder is never followed) beside the target, checked with fstat to
 * be the regular file just made, written, flushed to the disk, and renamed
 * over the target. A target that is a character device or a FIFO (/dev/null,
 * /dev/stdout, a pipe) is written directly, never replaced; a symbolic link,
 * a folder, a block device or a socket is refused. A failed write leaves the
 * previous file as it was and no temporary behind.
 *
 * Writing a folder. ow_io_dir_begin makes an empty sibling temporary folder
 * ("<parent>/.<name>.XXXXXX"); files are written into it; ow_io_dir_commit
 * exchanges it with the target in one rename (renameat2 RENAME_EXCHANGE) or
 * renames it into place when there is none, so a reader sees either the
 * whole previous folder or the whole new one. */
#ifndef OW_IO_H
#define OW_IO_H

#include <stddef.h>

#include "ow_status.h"

/* ---- growable buffer -------------------------------------------------- */

/* Bytes with a NUL kept after them, so text can be used as a string. A
 * zeroed struct is an empty buffer. After a failed allocation every later
 * add does nothing and ow_buf_take reports OW_ENOMEM. */
struct ow_buf {
	char *data;
	size_t len, cap;
	int oom;
};

/* Append n bytes of p / the string s. */
void ow_buf_add(struct ow_buf *b, const void *p, size_t n);
void ow_buf_adds(struct ow_buf *b, const char *s);

/* Hand the bytes (NUL-terminated, malloc'd: the caller frees) to *out and
 * their count to *len (may be NULL); the buffer is empty afterwards.
 * OW_ENOMEM if an add failed (the buffer is freed). */
enum ow_status ow_buf_take(struct ow_buf *b, char **out, size_t *len,
                           struct ow_diag *d);

/* Free the bytes and empty the buffer (NULL-safe). */
void ow_buf_free(struct ow_buf *b);

/* ---- reading ---------------------------------------------------------- */

/* The whole regular file at path into a malloc'd, NUL-terminated buffer
 * (*out, the caller frees; *len its byte count, may be NULL). Opens
 * without blocking (a FIFO is refused, never waited on) and without
 * becoming the controlling terminal. Returns 0 or an errno value: EISDIR
 * for a folder, EINVAL for anything else that is not a regular file, EFBIG
 * when the file holds more than max bytes. */
int ow_io_slurp(const char *path, size_t max, char **out, size_t *len);

/* ow_io_slurp with the failure as OW_EINPUT and the message "<path>: is a
 * folder, not a file" / "<path>: is not a regular file" / "<path>: larger
 * than <max> bytes" / "<path>: cannot be read: <reason>". */
enum ow_status ow_io_read_file(const char *path, size_t max, char **out,
                               size_t *len, struct ow_diag *d);

/* Text for an errno value returned by ow_io_slurp ("is a folder, not a
 * file", "is not a regular file", "too large", or strerror). */
const char *ow_io_strerror(int err, char *buf, size_t n);

/* ---- writing ---------------------------------------------------------- */

/* Write len bytes to path as described above. OW_EIO naming the path and
 * the reason when it cannot be done (nothing replaced then). */
enum ow_status ow_io_write_file(const char *path, const void *data, size_t len,
                                struct ow_diag *d);

/* Can folder dir be written as a whole? Its parent must be an existing
 * folder this process can create entries in (faccessat with the effective
 * ids: permissions, a read-only file system), and dir must be absent or a
 * folder, not a symbolic link. OW_EIO naming dir and the reason
 * otherwise. Nothing is created. */
enum ow_status ow_io_dir_check(const char *dir, struct ow_diag *d);

/* Make the sibling temporary folder for dir; its path into tmp[n]. */
enum ow_status ow_io_dir_begin(const char *dir, char *tmp, size_t n,
                               struct ow_diag *d);

/* Put the finished folder tmp in place of dir. When dir existed, the
 * previous folder is now at tmp (old = 1); otherwise tmp is gone (old =
 * 0). OW_EIO naming dir when it cannot be done (tmp is then untouched). */
enum ow_status ow_io_dir_commit(const char *tmp, const char *dir, int *old,
                                struct ow_diag *d);

/* Remove folder dir: each entry keep() (may be NULL) wants is renamed into
 * folder dest (never over an entry of dest; NULL dest: it stays), every
 * other file is deleted. Sub-folders keep() does not want stay (never
 * descended into), links are deleted, never followed. dir itself is
 * removed when it ends up empty. Returns 0 when dir is gone, -1 when
 * something stayed. */
int ow_io_dir_remove(const char *dir, int (*keep)(const char *name, void *ctx),
                     void *ctx, const char *dest);

/* Entries of folder dir besides "." and "..", -1 when it cannot be read. */
int ow_io_dir_count(const char *dir);

/* The names of the regular files in dir, sorted, joined by '\n' (a
 * malloc'd string: the caller frees); names starting with '.' are left
 * out. NULL when dir cannot be read. */
char *ow_io_dir_list(const char *dir);

/* ---- text ------------------------------------------------------------- */

/* Write x into buf with "%.17g" semantics (shortest form that round-trips
 * is not required, but every digit needed is there); "null" for NaN/inf
 * when json is set, "" otherwise. Independent of the locale (the program
 * never calls setlocale). Returns buf. */
char *ow_fmt_double(char *buf, size_t n, double x, int json);

/* Offset of the first byte of p[0..n) that is not well-formed UTF-8
 * (RFC 3629: no overlong forms, no surrogates, nothing above U+10FFFF),
 * or n when all of it is. */
size_t ow_io_utf8_check(const void *p, size_t n);

/* ---- checksums -------------------------------------------------------- */

/* CRC-32 of ISO 3309 / IEEE 802.3 continued over n bytes: start with 0. */
unsigned long ow_io_crc32(unsigned long crc, const void *p, size_t n);

#endif
