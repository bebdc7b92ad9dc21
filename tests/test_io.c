/* test_io.c - the file layer: CRC-32 and UTF-8 against their published
 * definitions, the reader that refuses what is not a regular file, the
 * writer that never follows a link nor replaces a device or FIFO, and
 * folders put in place whole. */
#include "testutil.h"

#include <errno.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include "ow_io.h"

struct fx {
	char dir[64];
	char path[160];
};

static int setup(void **state)
{
	struct fx *f = calloc(1, sizeof *f);

	assert_non_null(f);
	strcpy(f->dir, "/tmp/test_io.XXXXXX");
	assert_non_null(mkdtemp(f->dir));
	*state = f;
	return 0;
}

static int teardown(void **state)
{
	struct fx *f = *state;
	char cmd[128];

	snprintf(cmd, sizeof cmd, "rm -rf '%s'", f->dir);
	assert_int_equal(system(cmd), 0);
	free(f);
	return 0;
}

static const char *in(struct fx *f, const char *name)
{
	snprintf(f->path, sizeof f->path, "%s/%s", f->dir, name);
	return f->path;
}

static void put(const char *path, const char *text)
{
	FILE *fp = fopen(path, "w");

	assert_non_null(fp);
	fputs(text, fp);
	assert_int_equal(fclose(fp), 0);
}

static void holds(const char *path, const char *want)
{
	char *text = NULL;

	assert_int_equal(ow_io_slurp(path, 1 << 20, &text, NULL), 0);
	assert_string_equal(text, want);
	free(text);
}

/* Entries of dir whose names start with '.' (temporaries). */
static int dotfiles(const char *dir)
{
	char cmd[160];
	FILE *p;
	int n = 0, c;

	snprintf(cmd, sizeof cmd, "ls -A '%s' | grep -c '^\\.'", dir);
	p = popen(cmd, "r");
	assert_non_null(p);
	c = fscanf(p, "%d", &n);
	pclose(p);
	return c == 1 ? n : -1;
}

static void crc32_gives_the_published_check_value(void **state)
{
	(void)state;
	/* CRC-32/ISO-HDLC of "123456789" is 0xCBF43926 (Williams, "A
	 * painless guide to CRC error detection algorithms", 1993, ch. 17) */
	assert_int_equal(ow_io_crc32(0, "123456789", 9), 0xCBF43926UL);
	/* continued over two pieces: the same sum */
	assert_int_equal(ow_io_crc32(ow_io_crc32(0, "1234", 4), "56789", 5),
	                 0xCBF43926UL);
}

static void utf8_follows_rfc_3629(void **state)
{
	/* valid: the examples of RFC 3629, section 7 */
	static const char *const good[] = {
	    "\x41\xE2\x89\xA2\xCE\x91\x2E", /* A<NOT IDENTICAL TO><ALPHA>. */
	    "\xED\x95\x9C\xEA\xB5\xAD\xEC\x96\xB4", /* Korean "hangugeo" */
	    "\xE6\x97\xA5\xE6\x9C\xAC\xE8\xAA\x9E", /* Japanese "nihongo" */
	    "\xEF\xBB\xBF\xF0\xA3\x8E\xB4",         /* BOM, U+233B4 */
	    "\xF4\x8F\xBF\xBF"};                    /* U+10FFFF, the last */
	/* ill-formed per RFC 3629 sections 3 and 10: an overlong "/", a
	 * surrogate, beyond U+10FFFF, a lone continuation byte, a cut
	 * sequence, bytes never used (C0, F5..FF) */
	static const char *const bad[] = {
	    "\xC0\xAF", "a\xED\xA0\x80", "ab\xF4\x90\x80\x80",
	    "abc\x80",  "\xE2\x89",      "\xF5\x80\x80\x80",
	    "\xFF"};
	static const size_t at[] = {0, 1, 2, 3, 0, 0, 0};
	size_t i;

	(void)state;
	for (i = 0; i < sizeof good / sizeof good[0]; i++)
		assert_int_equal(ow_io_utf8_check(good[i], strlen(good[i])),
		                 strlen(good[i]));
	for (i = 0; i < sizeof bad / sizeof bad[0]; i++)
		assert_int_equal(ow_io_utf8_check(bad[i], strlen(bad[i])),
		                 at[i]);
}

/* Seventeen significant decimal digits are enough for any binary64 value
 * to read back exactly (IEEE 754-2008, section 5.12.2); JSON has no NaN
 * or infinity (RFC 8259, section 6), so those print as null there. */
static void numbers_print_so_that_they_read_back_exactly(void **state)
{
	static const double x[] = {
	    0.1,    1.0 / 3.0, -2.5e-300, 4.9e-324, 1.7976931348623157e308,
	    473.15, 6e-5};
	char buf[40];
	size_t i;

	(void)state;
	for (i = 0; i < sizeof x / sizeof x[0]; i++)
		assert_true(strtod(ow_fmt_double(buf, sizeof buf, x[i], 1),
		                   NULL) == x[i]);
	assert_string_equal(ow_fmt_double(buf, sizeof buf, NAN, 1), "null");
	assert_string_equal(ow_fmt_double(buf, sizeof buf, -INFINITY, 1),
	                    "null");
	assert_string_equal(ow_fmt_double(buf, sizeof buf, NAN, 0), "");
}

static void buffer_grows_and_hands_over_a_string(void **state)
{
	struct ow_buf b = {0};
	char *out = NULL, piece[1000];
	size_t len = 0;
	int i;

	(void)state;
	memset(piece, 'x', sizeof piece - 1);
	piece[sizeof piece - 1] = '\0';
	for (i = 0; i < 100; i++)
		ow_buf_adds(&b, piece);
	ow_buf_add(&b, "\0z", 2); /* bytes, NUL included */
	assert_int_equal(ow_buf_take(&b, &out, &len, NULL), OW_OK);
	assert_int_equal(len, 100 * 999 + 2);
	assert_int_equal(strlen(out), 100 * 999);
	assert_int_equal(out[len - 1], 'z');
	assert_null(b.data);
	free(out);
	assert_int_equal(ow_buf_take(&b, &out, &len, NULL), OW_OK);
	assert_string_equal(out, ""); /* an empty buffer is an empty text */
	free(out);
}

static void reader_refuses_folders_fifos_and_large_files(void **state)
{
	struct fx *f = *state;
	char *text = (char *)1;
	struct ow_diag d = {{0}};

	put(in(f, "a.txt"), "hello");
	holds(f->path, "hello");
	assert_int_equal(ow_io_slurp(f->dir, 100, &text, NULL), EISDIR);
	assert_null(text);
	assert_int_equal(mkfifo(in(f, "fifo"), 0600), 0);
	/* never blocks waiting for a writer */
	assert_int_equal(ow_io_slurp(f->path, 100, &text, NULL), EINVAL);
	assert_int_equal(ow_io_slurp(in(f, "a.txt"), 4, &text, NULL), EFBIG);
	assert_int_equal(ow_io_read_file(in(f, "none"), 4, &text, NULL, &d),
	                 OW_EINPUT);
	/* the system's reason, as strerror gives it */
	assert_non_null(strstr(d.msg, "none: cannot be read"));
	assert_non_null(strstr(d.msg, strerror(ENOENT)));
}

static void writer_replaces_a_file_keeping_its_mode(void **state)
{
	struct fx *f = *state;
	struct stat sb;

	put(in(f, "out.csv"), "old");
	assert_int_equal(chmod(f->path, 0640), 0);
	assert_int_equal(ow_io_write_file(f->path, "new", 3, NULL), OW_OK);
	holds(f->path, "new");
	assert_int_equal(stat(f->path, &sb), 0);
	assert_int_equal(sb.st_mode & 0777, 0640);
	assert_int_equal(dotfiles(f->dir), 0);
}

static void writer_never_follows_or_replaces_a_link(void **state)
{
	struct fx *f = *state;
	char victim[160];
	struct ow_diag d = {{0}};
	struct stat sb;

	snprintf(victim, sizeof victim, "%s", in(f, "victim"));
	put(victim, "secret");
	assert_int_equal(symlink(victim, in(f, "link.csv")), 0);
	assert_int_equal(ow_io_write_file(f->path, "x", 1, &d), OW_EIO);
	assert_non_null(strstr(d.msg, "symbolic link"));
	holds(victim, "secret");
	assert_int_equal(lstat(f->path, &sb), 0);
	assert_true(S_ISLNK(sb.st_mode));
	assert_int_equal(dotfiles(f->dir), 0);
}

static void writer_writes_devices_in_place_and_refuses_idle_fifos(void **state)
{
	struct fx *f = *state;
	struct ow_diag d = {{0}};
	struct stat sb;

	/* /dev/full: every write fails with ENOSPC (Linux mem devices) */
	assert_int_equal(ow_io_write_file("/dev/full", "x", 1, &d), OW_EIO);
	assert_non_null(strstr(d.msg, "/dev/full"));
	assert_int_equal(stat("/dev/full", &sb), 0);
	assert_true(S_ISCHR(sb.st_mode));
	assert_int_equal(mkfifo(in(f, "pipe"), 0600), 0);
	ow_diag_clear(&d);
	assert_int_equal(ow_io_write_file(f->path, "x", 1, &d), OW_EIO);
	assert_non_null(strstr(d.msg, "no process reads"));
	assert_int_equal(stat(f->path, &sb), 0);
	assert_true(S_ISFIFO(sb.st_mode));
}

static void writer_into_a_missing_folder_fails_cleanly(void **state)
{
	struct fx *f = *state;
	struct ow_diag d = {{0}};

	assert_int_equal(ow_io_write_file(in(f, "no/such/x"), "x", 1, &d),
	                 OW_EIO);
	assert_non_null(strstr(d.msg, "no/such/x"));
	assert_int_equal(dotfiles(f->dir), 0);
}

static int is_mine(const char *name, void *ctx)
{
	(void)ctx;
	return strcmp(name, "mine.txt") == 0;
}

/* Write text into dir/name, or check that dir/name holds want. */
static void put_in(const char *dir, const char *name, const char *text)
{
	char file[300];

	snprintf(file, sizeof file, "%s/%s", dir, name);
	put(file, text);
}

static void holds_in(const char *dir, const char *name, const char *want)
{
	char file[300];

	snprintf(file, sizeof file, "%s/%s", dir, name);
	holds(file, want);
}

/* A new folder with a.csv holding text, put in place of dir; *old says
 * whether a previous folder was there (then now at tmp). */
static void new_folder(const char *dir, char *tmp, size_t n, const char *text,
                       int *old)
{
	assert_int_equal(ow_io_dir_begin(dir, tmp, n, NULL), OW_OK);
	put_in(tmp, "a.csv", text);
	assert_int_equal(ow_io_dir_commit(tmp, dir, old, NULL), OW_OK);
}

static void a_folder_is_put_in_place_whole(void **state)
{
	struct fx *f = *state;
	char dir[160], tmp[200];
	int old = 1;

	snprintf(dir, sizeof dir, "%s/out", f->dir);
	assert_int_equal(ow_io_dir_check(dir, NULL), OW_OK);
	assert_int_equal(dotfiles(f->dir), 0); /* the check leaves nothing */
	new_folder(dir, tmp, sizeof tmp, "first", &old);
	assert_int_equal(old, 0); /* no folder yet: renamed into place */
	holds_in(dir, "a.csv", "first");
	put_in(dir, "mine.txt", "keep");
	new_folder(dir, tmp, sizeof tmp, "second", &old);
	assert_int_equal(old, 1); /* exchanged: the previous one is at tmp */
	holds_in(dir, "a.csv", "second");
	holds_in(tmp, "a.csv", "first");
	/* the previous folder goes; what the keeper wants moves on */
	assert_int_equal(ow_io_dir_remove(tmp, is_mine, NULL, dir), 0);
	assert_int_equal(access(tmp, F_OK), -1);
	holds_in(dir, "mine.txt", "keep");
	assert_int_equal(ow_io_dir_count(dir), 2);
	assert_int_equal(dotfiles(f->dir), 0);
}

static void a_folder_check_names_what_is_in_the_way(void **state)
{
	struct fx *f = *state;
	struct ow_diag d = {{0}};
	char path[200];

	put(in(f, "plain"), "x");
	snprintf(path, sizeof path, "%s/sub", f->path);
	assert_int_equal(ow_io_dir_check(path, &d), OW_EIO);
	assert_non_null(strstr(d.msg, "is not a folder"));
	ow_diag_clear(&d);
	assert_int_equal(ow_io_dir_check(in(f, "plain"), &d), OW_EIO);
	assert_non_null(strstr(d.msg, "not a folder"));
	ow_diag_clear(&d);
	assert_int_equal(symlink(f->dir, in(f, "ln")), 0);
	assert_int_equal(ow_io_dir_check(f->path, &d), OW_EIO);
	assert_non_null(strstr(d.msg, "symbolic link"));
	/* renamed into place, a folder needs a name of its own */
	ow_diag_clear(&d);
	assert_int_equal(ow_io_dir_check(".", &d), OW_EIO);
	assert_non_null(strstr(d.msg, "name the folder itself"));
	assert_int_equal(ow_io_dir_check("/", NULL), OW_EIO);
	snprintf(path, sizeof path, "%s/new//", f->dir); /* as typed */
	assert_int_equal(ow_io_dir_check(path, NULL), OW_OK);
}

int main(void)
{
	const struct CMUnitTest tests[] = {
	    cmocka_unit_test(crc32_gives_the_published_check_value),
	    cmocka_unit_test(utf8_follows_rfc_3629),
	    cmocka_unit_test(numbers_print_so_that_they_read_back_exactly),
	    cmocka_unit_test(buffer_grows_and_hands_over_a_string),
	    cmocka_unit_test_setup_teardown(
	        reader_refuses_folders_fifos_and_large_files, setup, teardown),
	    cmocka_unit_test_setup_teardown(
	        writer_replaces_a_file_keeping_its_mode, setup, teardown),
	    cmocka_unit_test_setup_teardown(
	        writer_never_follows_or_replaces_a_link, setup, teardown),
	    cmocka_unit_test_setup_teardown(
	        writer_writes_devices_in_place_and_refuses_idle_fifos, setup,
	        teardown),
	    cmocka_unit_test_setup_teardown(
	        writer_into_a_missing_folder_fails_cleanly, setup, teardown),
	    cmocka_unit_test_setup_teardown(a_folder_is_put_in_place_whole,
	                                    setup, teardown),
	    cmocka_unit_test_setup_teardown(
	        a_folder_check_names_what_is_in_the_way, setup, teardown),
	};

	return cmocka_run_group_tests(tests, NULL, NULL);
}
