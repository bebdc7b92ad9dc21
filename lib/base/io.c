/* io.c - the file layer: growable buffer, whole-file reader, atomic file
 * and folder writes, CRC-32 (see ow_io.h). Uses nothing of opwin but
 * ow_status. */
#define _GNU_SOURCE /* renameat2, mkostemp */
#include "ow_io.h"

#include <dirent.h>
#include <errno.h>
#include <fcntl.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

/* ---- growable buffer -------------------------------------------------- */

void ow_buf_add(struct ow_buf *b, const void *p, size_t n)
{
	if (b->oom)
		return;
	if (n >= (size_t)-1 / 2 - b->len) {
		b->oom = 1;
		return;
	}
	if (b->len + n + 1 > b->cap) {
		size_t cap = b->cap ? 2 * b->cap : 8192;
		char *nb;

		while (cap < b->len + n + 1)
			cap *= 2;
		nb = realloc(b->data, cap);
		if (!nb) {
			b->oom = 1;
			return;
		}
		b->data = nb;
		b->cap = cap;
	}
	if (n)
		memcpy(b->data + b->len, p, n);
	b->len += n;
	b->data[b->len] = '\0';
}

void ow_buf_adds(struct ow_buf *b, const char *s)
{
	ow_buf_add(b, s, strlen(s));
}

void ow_buf_free(struct ow_buf *b)
{
	if (!b)
		return;
	free(b->data);
	memset(b, 0, sizeof *b);
}

enum ow_status ow_buf_take(struct ow_buf *b, char **out, size_t *len,
                           struct ow_diag *d)
{
	*out = NULL;
	if (!b->oom && !b->data)
		ow_buf_add(b, "", 0); /* an empty text is still a string */
	if (b->oom) {
		ow_buf_free(b);
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	}
	*out = b->data;
	if (len)
		*len = b->len;
	memset(b, 0, sizeof *b);
	return OW_OK;
}

/* ---- reading ---------------------------------------------------------- */

/* Read to the end of fd, at most max bytes (EFBIG beyond: the size seen
 * by fstat may grow while reading). */
static int read_all(int fd, size_t max, char **out, size_t *len)
{
	struct ow_buf b = {0};
	char chunk[65536];
	ssize_t got;

	for (;;) {
		got = read(fd, chunk, sizeof chunk);
		if (got < 0 && errno == EINTR)
			continue;
		if (got < 0) {
			int err = errno;

			ow_buf_free(&b);
			return err;
		}
		if (got == 0)
			break;
		if (b.len + (size_t)got > max) {
			ow_buf_free(&b);
			return EFBIG;
		}
		ow_buf_add(&b, chunk, (size_t)got);
	}
	return ow_buf_take(&b, out, len, NULL) == OW_OK ? 0 : ENOMEM;
}

int ow_io_slurp(const char *path, size_t max, char **out, size_t *len)
{
	struct stat st;
	int fd, err, fl;

	*out = NULL;
	if (len)
		*len = 0;
	fd = open(path, O_RDONLY | O_NONBLOCK | O_NOCTTY | O_CLOEXEC);
	if (fd < 0)
		return errno;
	if (fstat(fd, &st) != 0) {
		err = errno;
		goto done;
	}
	if (!S_ISREG(st.st_mode)) {
		err = S_ISDIR(st.st_mode) ? EISDIR : EINVAL;
		goto done;
	}
	if ((size_t)st.st_size > max) {
		err = EFBIG;
		goto done;
	}
	fl = fcntl(fd, F_GETFL);
	if (fl != -1)
		fcntl(fd, F_SETFL, fl & ~O_NONBLOCK);
	err = read_all(fd, max, out, len);
done:
	close(fd);
	return err;
}

const char *ow_io_strerror(int err, char *buf, size_t n)
{
	if (err == EISDIR)
		snprintf(buf, n, "is a folder, not a file");
	else if (err == EINVAL)
		snprintf(buf, n, "is not a regular file");
	else if (err == EFBIG)
		snprintf(buf, n, "too large");
	else {
#if defined(__GLIBC__)
		/* _GNU_SOURCE (above) selects the GNU strerror_r: it returns
		 * the text, which may be a static string, not buf */
		const char *m = strerror_r(err, buf, n);

		if (m != buf)
			snprintf(buf, n, "%s", m);
#else
		if (strerror_r(err, buf, n) != 0)
			snprintf(buf, n, "error %d", err);
#endif
	}
	return buf;
}

enum ow_status ow_io_read_file(const char *path, size_t max, char **out,
                               size_t *len, struct ow_diag *d)
{
	char eb[128];
	int err = ow_io_slurp(path, max, out, len);

	if (err == 0)
		return OW_OK;
	if (err == ENOMEM)
		return ow_diag_set(d, OW_ENOMEM, "%s: out of memory", path);
	if (err == EFBIG)
		return ow_diag_set(d, OW_EINPUT, "%s: larger than %zu bytes",
		                   path, max);
	if (err == EISDIR || err == EINVAL)
		return ow_diag_set(d, OW_EINPUT, "%s: %s", path,
		                   ow_io_strerror(err, eb, sizeof eb));
	return ow_diag_set(d, OW_EINPUT, "%s: cannot be read: %s", path,
	                   ow_io_strerror(err, eb, sizeof eb));
}

/* ---- writing ---------------------------------------------------------- */

static int write_all(int fd, const void *data, size_t len)
{
	const char *p = data;
	ssize_t put;

	while (len > 0) {
		put = write(fd, p, len);
		if (put < 0 && errno == EINTR)
			continue;
		if (put <= 0)
			return put < 0 ? errno : EIO;
		p += put;
		len -= (size_t)put;
	}
	return 0;
}

/* The process's umask without changing it (umask(2) would race with
 * threads creating files): the "Umask:" line of /proc/self/status,
 * Linux 4.7 and later; 022 when it cannot be read. */
static mode_t current_umask(void)
{
	FILE *f = fopen("/proc/self/status", "re");
	char line[128];
	unsigned int m = 022;

	while (f && fgets(line, sizeof line, f))
		if (sscanf(line, "Umask: %o", &m) == 1)
			break;
	if (f)
		fclose(f);
	return (mode_t)(m & 0777);
}

/* The last name in path, trailing slashes ignored ("out/map/" -> "map"):
 * its start *base and length; returns the length of what comes before. */
static size_t last_name(const char *path, const char **base, size_t *len)
{
	size_t end = strlen(path), start;

	while (end > 1 && path[end - 1] == '/')
		end--;
	for (start = end; start > 0 && path[start - 1] != '/'; start--)
		;
	*base = path + start;
	*len = end - start;
	return start;
}

/* "<folder of path>/.<name>.<suffix>" into a malloc'd string. */
static char *sibling(const char *path, const char *suffix)
{
	const char *base;
	size_t blen, dlen = last_name(path, &base, &blen);
	size_t n = dlen + blen + strlen(suffix) + 3;
	char *t = malloc(n);

	if (t)
		snprintf(t, n, "%.*s.%.*s.%s", (int)dlen, path, (int)blen, base,
		         suffix);
	return t;
}

/* A character device or FIFO is written where it is, never replaced. A
 * FIFO nobody reads is refused (ENXIO) rather than waited on. */
static int write_direct(const char *path, const void *data, size_t len)
{
	int fd = open(path, O_WRONLY | O_NONBLOCK | O_NOCTTY | O_CLOEXEC);
	int err, fl;

	if (fd < 0)
		return errno;
	fl = fcntl(fd, F_GETFL);
	if (fl != -1)
		fcntl(fd, F_SETFL, fl & ~O_NONBLOCK);
	err = write_all(fd, data, len);
	if (close(fd) != 0 && !err)
		err = errno;
	return err;
}

/* Temporary beside path, written and flushed, renamed over path. */
static int write_replace(const char *path, const void *data, size_t len,
                         mode_t mode)
{
	char *tmp = sibling(path, "XXXXXX");
	struct stat st;
	int fd, err = 0;

	if (!tmp)
		return ENOMEM;
	fd = mkostemp(tmp, O_CLOEXEC);
	if (fd < 0) {
		err = errno;
		free(tmp);
		return err;
	}
	/* the file just made: regular and empty (owner and link count are
	 * left alone: network and foreign file systems report their own) */
	if (fstat(fd, &st) != 0 || !S_ISREG(st.st_mode) || st.st_size != 0)
		err = EPERM;
	if (!err && fchmod(fd, mode) != 0)
		err = errno;
	if (!err)
		err = write_all(fd, data, len);
	if (!err && fsync(fd) != 0 && errno != EINVAL && errno != EROFS)
		err = errno;
	if (close(fd) != 0 && !err)
		err = errno;
	if (!err && rename(tmp, path) != 0)
		err = errno;
	if (err)
		unlink(tmp);
	free(tmp);
	return err;
}

enum ow_status ow_io_write_file(const char *path, const void *data, size_t len,
                                struct ow_diag *d)
{
	struct stat lst, st;
	char eb[128];
	mode_t mode = 0666 & ~current_umask();
	int err;

	if (!path || !*path || (!data && len))
		return ow_diag_set(d, OW_EARG,
		                   "ow_io_write_file: bad argument");
	if (lstat(path, &lst) == 0) {
		if (S_ISLNK(lst.st_mode) && stat(path, &st) == 0 &&
		    (S_ISCHR(st.st_mode) || S_ISFIFO(st.st_mode)))
			lst = st; /* /dev/stdout and the like */
		if (S_ISCHR(lst.st_mode) || S_ISFIFO(lst.st_mode)) {
			err = write_direct(path, data, len);
			goto done;
		}
		if (S_ISLNK(lst.st_mode))
			return ow_diag_set(d, OW_EIO,
			                   "%s: is a symbolic link: "
			                   "not followed, not replaced; name "
			                   "the file itself",
			                   path);
		if (S_ISDIR(lst.st_mode))
			return ow_diag_set(d, OW_EIO, "%s: is a folder", path);
		if (!S_ISREG(lst.st_mode))
			return ow_diag_set(d, OW_EIO,
			                   "%s: is not a regular "
			                   "file: not replaced",
			                   path);
		mode = lst.st_mode & 0777; /* never set-id bits */
	} else if (errno != ENOENT) {
		err = errno;
		goto done;
	}
	err = write_replace(path, data, len, mode);
done:
	if (err == ENXIO)
		return ow_diag_set(d, OW_EIO, "%s: no process reads this FIFO",
		                   path);
	if (err)
		return ow_diag_set(d, OW_EIO, "%s: cannot write: %s", path,
		                   ow_io_strerror(err, eb, sizeof eb));
	return OW_OK;
}

/* ---- folders ---------------------------------------------------------- */

/* The parent folder of dir ("." when dir has no slash) into a malloc'd
 * string. */
static char *parent_of(const char *dir)
{
	size_t n = strlen(dir);
	char *p;

	while (n > 1 && dir[n - 1] == '/')
		n--;
	while (n > 0 && dir[n - 1] != '/')
		n--;
	while (n > 1 && dir[n - 1] == '/')
		n--;
	if (n == 0)
		return strdup(".");
	p = malloc(n + 1);
	if (p) {
		memcpy(p, dir, n);
		p[n] = '\0';
	}
	return p;
}

enum ow_status ow_io_dir_check(const char *dir, struct ow_diag *d)
{
	char eb[128];
	char *parent = parent_of(dir);
	struct stat st;
	enum ow_status s = OW_OK;

	const char *base;
	size_t blen;

	last_name(dir, &base, &blen);
	if (!parent)
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	if (blen == 0 || *base == '/' || !strncmp(base, ".", blen) ||
	    !strncmp(base, "..", blen)) {
		/* a folder is put in place by renaming it: it needs a name */
		s = ow_diag_set(d, OW_EIO,
		                "%s: name the folder itself (as "
		                "in out/map), not \".\", \"..\" or \"/\"",
		                dir);
		goto done;
	}
	if (lstat(dir, &st) == 0 && !S_ISDIR(st.st_mode)) {
		s = ow_diag_set(d, OW_EIO, "%s: %s", dir,
		                S_ISLNK(st.st_mode)
		                    ? "is a symbolic link: name the "
		                      "folder itself"
		                    : "a file has that name, not a folder");
		goto done;
	}
	if (stat(parent, &st) != 0 || !S_ISDIR(st.st_mode)) {
		s = ow_diag_set(d, OW_EIO,
		                "%s: cannot create the folder: %s "
		                "is not a folder",
		                dir, parent);
		goto done;
	}
	/* with the effective ids, as creating would; EROFS on a read-only
	 * file system. Nothing is made, so a signal leaves nothing behind. */
	if (faccessat(AT_FDCWD, parent, W_OK | X_OK, AT_EACCESS) != 0)
		s = ow_diag_set(d, OW_EIO, "%s: cannot create the folder: %s",
		                dir, ow_io_strerror(errno, eb, sizeof eb));
done:
	free(parent);
	return s;
}

enum ow_status ow_io_dir_begin(const char *dir, char *tmp, size_t n,
                               struct ow_diag *d)
{
	char *t = sibling(dir, "XXXXXX");
	char eb[128];

	if (!t || strlen(t) >= n) {
		free(t);
		return ow_diag_set(d, OW_EIO, "%s: folder name too long", dir);
	}
	if (!mkdtemp(t)) {
		int err = errno;

		free(t);
		return ow_diag_set(d, OW_EIO,
		                   "%s: cannot create the folder: %s", dir,
		                   ow_io_strerror(err, eb, sizeof eb));
	}
	snprintf(tmp, n, "%s", t);
	free(t);
	return OW_OK;
}

enum ow_status ow_io_dir_commit(const char *tmp, const char *dir, int *old,
                                struct ow_diag *d)
{
	char eb[128];
	int err;

	*old = 0;
	if (rename(tmp, dir) == 0) /* no folder there, or an empty one */
		return OW_OK;
	err = errno;
	if (err == EEXIST || err == ENOTEMPTY) {
		if (renameat2(AT_FDCWD, tmp, AT_FDCWD, dir, RENAME_EXCHANGE) ==
		    0) {
			*old = 1;
			return OW_OK;
		}
		err = errno;
	}
	return ow_diag_set(d, OW_EIO, "%s: cannot put the folder in place: %s",
	                   dir, ow_io_strerror(err, eb, sizeof eb));
}

int ow_io_dir_remove(const char *dir, int (*keep)(const char *name, void *ctx),
                     void *ctx, const char *dest)
{
	DIR *dp = opendir(dir);
	struct dirent *e;
	int dfd, destfd = -1, stayed = 0;

	if (!dp)
		return errno == ENOENT ? 0 : -1;
	dfd = dirfd(dp);
	if (dest)
		destfd = open(dest, O_RDONLY | O_DIRECTORY | O_CLOEXEC);
	while ((e = readdir(dp)) != NULL) {
		struct stat st;

		if (!strcmp(e->d_name, ".") || !strcmp(e->d_name, ".."))
			continue;
		if (fstatat(dfd, e->d_name, &st, AT_SYMLINK_NOFOLLOW) != 0) {
			stayed = 1;
			continue;
		}
		if (keep && keep(e->d_name, ctx)) {
			if (destfd < 0 ||
			    renameat2(dfd, e->d_name, destfd, e->d_name,
			              RENAME_NOREPLACE) != 0)
				stayed = 1;
			continue;
		}
		if (S_ISDIR(st.st_mode) || unlinkat(dfd, e->d_name, 0) != 0)
			stayed = 1;
	}
	closedir(dp);
	if (destfd >= 0)
		close(destfd);
	if (stayed || rmdir(dir) != 0)
		return -1;
	return 0;
}

int ow_io_dir_count(const char *dir)
{
	DIR *dp = opendir(dir);
	struct dirent *e;
	int n = 0;

	if (!dp)
		return -1;
	while ((e = readdir(dp)) != NULL)
		n += strcmp(e->d_name, ".") && strcmp(e->d_name, "..");
	closedir(dp);
	return n;
}

static int by_name(const void *a, const void *b)
{
	return strcmp(*(char *const *)a, *(char *const *)b);
}

char *ow_io_dir_list(const char *dir)
{
	DIR *dp = opendir(dir);
	struct ow_buf names = {0}, out = {0};
	struct dirent *e;
	char **v = NULL, *p, *text = NULL;
	size_t n = 0, i;

	if (!dp)
		return NULL;
	while ((e = readdir(dp)) != NULL) {
		struct stat st;

		if (e->d_name[0] == '.' ||
		    fstatat(dirfd(dp), e->d_name, &st, AT_SYMLINK_NOFOLLOW) ||
		    !S_ISREG(st.st_mode))
			continue;
		ow_buf_add(&names, e->d_name, strlen(e->d_name) + 1);
		n++;
	}
	closedir(dp);
	if (names.oom || (n && !(v = malloc(n * sizeof *v))))
		goto done;
	for (i = 0, p = names.data; i < n; i++, p += strlen(p) + 1)
		v[i] = p;
	qsort(v, n, sizeof *v, by_name);
	for (i = 0; i < n; i++) {
		ow_buf_adds(&out, v[i]);
		ow_buf_adds(&out, "\n");
	}
	ow_buf_take(&out, &text, NULL, NULL);
done:
	free(v);
	ow_buf_free(&names);
	ow_buf_free(&out);
	return text;
}

/* ---- text ------------------------------------------------------------- */

char *ow_fmt_double(char *buf, size_t n, double x, int json)
{
	/* The program never calls setlocale, so printf uses the "C" locale's
	 * decimal point; 17 significant digits round-trip a double. */
	if (!isfinite(x))
		snprintf(buf, n, "%s", json ? "null" : "");
	else
		snprintf(buf, n, "%.17g", x);
	return buf;
}

/* Well-formed UTF-8 byte sequences, RFC 3629 (2003), section 4 (the
 * "UTF8-octets" grammar): the second byte's range depends on the first. */
size_t ow_io_utf8_check(const void *p, size_t n)
{
	const unsigned char *s = p;
	size_t i = 0, k, len;

	while (i < n) {
		unsigned char c = s[i], lo = 0x80, hi = 0xBF;

		if (c < 0x80) {
			i++;
			continue;
		}
		if (c >= 0xC2 && c <= 0xDF)
			len = 2;
		else if (c >= 0xE0 && c <= 0xEF)
			len = 3;
		else if (c >= 0xF0 && c <= 0xF4)
			len = 4;
		else
			return i;
		if (c == 0xE0)
			lo = 0xA0; /* overlong */
		else if (c == 0xED)
			hi = 0x9F; /* surrogates */
		else if (c == 0xF0)
			lo = 0x90; /* overlong */
		else if (c == 0xF4)
			hi = 0x8F; /* above U+10FFFF */
		if (i + len > n || s[i + 1] < lo || s[i + 1] > hi)
			return i;
		for (k = 2; k < len; k++)
			if (s[i + k] < 0x80 || s[i + k] > 0xBF)
				return i;
		i += len;
	}
	return n;
}

/* ---- checksums -------------------------------------------------------- */

/* Bitwise CRC-32 of ISO 3309 / IEEE 802.3 (reflected polynomial
 * 0xEDB88320, initial value and final xor 0xFFFFFFFF); check value
 * CRC("123456789") = 0xCBF43926 (Williams, "A painless guide to CRC error
 * detection algorithms", 1993, ch. 17). Inverting on entry and exit makes
 * the function continuable: crc(a || b) = crc32(crc32(0, a), b). */
unsigned long ow_io_crc32(unsigned long crc, const void *p, size_t n)
{
	const unsigned char *b = p;
	int k;

	crc = ~crc & 0xFFFFFFFFUL;
	while (n--) {
		crc ^= *b++;
		for (k = 0; k < 8; k++) /* mask is all ones when bit 0 is set */
			crc = (crc >> 1) ^ (0xEDB88320UL & (0UL - (crc & 1UL)));
	}
	return ~crc & 0xFFFFFFFFUL;
}
