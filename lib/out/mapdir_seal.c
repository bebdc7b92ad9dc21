/* mapdir_seal.c - a map folder as a whole: the manifest that marks it
 * complete (every file's size and CRC-32, written last), its check before
 * the folder is read back, and putting a finished folder in place of the
 * previous one (see ow_mapdir.h). */
#include "mapdir_impl.h"

#include <cjson/cJSON.h>
#include <errno.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>

#define MANIFEST         "manifest.json"
#define MANIFEST_FORMAT  "opwin map folder manifest"
#define MANIFEST_VERSION 1
#define MANIFEST_MAX     ((size_t)1 << 20)

/* Files opwin writes into a map folder (also those of folders written
 * before the manifest existed, so they are recognised and replaced). */
static int is_output_name(const char *name)
{
	static const char *const fixed[] = {
	    MANIFEST,         "grid.csv",      "window.json", "report.pdf",
	    "study.json",     "lattice.json",  "lattice.csv", "profile.csv",
	    "points-si.json", "points-si.csv", "window.png",  "window.svg",
	    "profile.png",    "profile.svg",   "spread.json"};
	size_t i, n = strlen(name);

	for (i = 0; i < sizeof fixed / sizeof fixed[0]; i++)
		if (!strcmp(name, fixed[i]))
			return 1;
	return !strncmp(name, "map-", 4) && n > 8 &&
	       (!strcmp(name + n - 4, ".png") || !strcmp(name + n - 4, ".svg"));
}

/* Drawings are made again by `opwin report`; the rest is data. */
static int is_drawing(const char *name)
{
	size_t n = strlen(name);

	return !strcmp(name, "report.pdf") ||
	       (n > 4 && (!strcmp(name + n - 4, ".png") ||
	                  !strcmp(name + n - 4, ".svg")));
}

static enum ow_status file_entry(const char *dir, const char *name,
                                 cJSON *files, struct ow_diag *d)
{
	char path[OW_PATH_LEN + 32], crc[16], *buf = NULL;
	size_t len = 0;
	cJSON *e;
	enum ow_status st = ow_mapdir_path(path, sizeof path, dir, name, d);

	if (st == OW_OK)
		st = ow_io_read_file(path, MD_MAX_FILE_BYTES, &buf, &len, d);
	if (st != OW_OK)
		return st;
	snprintf(crc, sizeof crc, "%08lX", ow_io_crc32(0, buf, len));
	free(buf);
	e = cJSON_AddObjectToObject(files, name);
	if (!e || !cJSON_AddNumberToObject(e, "bytes", (double)len) ||
	    !cJSON_AddStringToObject(e, "crc32", crc))
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	return OW_OK;
}

enum ow_status ow_mapdir_seal(const char *dir, struct ow_diag *d)
{
	char path[OW_PATH_LEN + 32], *list = ow_io_dir_list(dir), *name, *nl;
	char *text = NULL;
	cJSON *o = cJSON_CreateObject(), *files = NULL;
	enum ow_status st = OW_OK;

	if (!list || !o) {
		st = list ? ow_diag_set(d, OW_ENOMEM, "out of memory")
		          : ow_diag_set(d, OW_EIO, "%s: cannot list the folder",
		                        dir);
		goto done;
	}
	if (!cJSON_AddStringToObject(o, "format", MANIFEST_FORMAT) ||
	    !cJSON_AddNumberToObject(o, "version", MANIFEST_VERSION) ||
	    !(files = cJSON_AddObjectToObject(o, "files"))) {
		st = ow_diag_set(d, OW_ENOMEM, "out of memory");
		goto done;
	}
	for (name = list; st == OW_OK && (nl = strchr(name, '\n'));
	     name = nl + 1) {
		*nl = '\0';
		if (strcmp(name, MANIFEST))
			st = file_entry(dir, name, files, d);
	}
	if (st == OW_OK && !(text = cJSON_Print(o)))
		st = ow_diag_set(d, OW_ENOMEM, "out of memory");
	if (st == OW_OK)
		st = ow_mapdir_path(path, sizeof path, dir, MANIFEST, d);
	if (st == OW_OK)
		st = ow_io_write_file(path, text, strlen(text), d);
done:
	free(text);
	free(list);
	cJSON_Delete(o);
	return st;
}

/* ---- verify ----------------------------------------------------------- */

static enum ow_status damaged(const char *dir, const char *what,
                              struct ow_diag *d)
{
	return ow_diag_set(d, OW_EINPUT,
	                   "%s: %s: the folder was changed or damaged since "
	                   "opwin wrote it; run the map again",
	                   dir, what);
}

static enum ow_status verify_file(const char *dir, const cJSON *e,
                                  struct ow_diag *d)
{
	const cJSON *bytes = cJSON_GetObjectItemCaseSensitive(e, "bytes");
	const cJSON *crc = cJSON_GetObjectItemCaseSensitive(e, "crc32");
	char path[OW_PATH_LEN + 32], what[OW_PATH_LEN + 96], want[16];
	char *buf = NULL;
	size_t len = 0;
	int err;

	if (!cJSON_IsNumber(bytes) || !cJSON_IsString(crc) ||
	    strchr(e->string, '/') || e->string[0] == '.')
		return damaged(dir, MANIFEST ": an entry is malformed", d);
	if (ow_mapdir_path(path, sizeof path, dir, e->string, d) != OW_OK)
		return OW_EINPUT;
	err = ow_mapdir_slurp(path, &buf, &len);
	if (err == ENOMEM)
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	if (err) {
		snprintf(what, sizeof what, "%s is missing or unreadable",
		         e->string);
		return damaged(dir, what, d);
	}
	snprintf(want, sizeof want, "%08lX", ow_io_crc32(0, buf, len));
	free(buf);
	if ((double)len != bytes->valuedouble ||
	    strcmp(want, crc->valuestring)) {
		snprintf(what, sizeof what,
		         "%s holds %zu bytes with CRC-32 %s; the manifest "
		         "says %.0f bytes, %s",
		         e->string, len, want, bytes->valuedouble,
		         crc->valuestring);
		return damaged(dir, what, d);
	}
	return OW_OK;
}

enum ow_status ow_mapdir_verify(const char *dir, struct ow_diag *d)
{
	char path[OW_PATH_LEN + 32], *text = NULL, eb[128];
	const cJSON *f, *v, *files, *e;
	cJSON *o = NULL;
	enum ow_status st = ow_mapdir_path(path, sizeof path, dir, MANIFEST, d);
	int err;

	struct stat sb;

	if (st != OW_OK)
		return st;
	if (stat(dir, &sb) != 0 || !S_ISDIR(sb.st_mode))
		return ow_diag_set(d, OW_EINPUT, "%s: %s", dir,
		                   stat(dir, &sb)
		                       ? "no such folder"
		                       : "not a folder (expected the "
		                         "output folder of opwin map)");
	err = ow_mapdir_slurp(path, &text, NULL);
	if (err == ENOENT)
		return ow_diag_set(d, OW_EINPUT,
		                   "%s is not a map folder: " MANIFEST
		                   " is missing (`opwin map STUDY.json -o DIR` "
		                   "writes it last: a run that did not finish, "
		                   "or an older opwin, left this folder)",
		                   dir);
	if (err)
		return ow_diag_set(d, OW_EINPUT, "%s: cannot read: %s", path,
		                   ow_io_strerror(err, eb, sizeof eb));
	o = cJSON_Parse(text);
	f = cJSON_GetObjectItemCaseSensitive(o, "format");
	v = cJSON_GetObjectItemCaseSensitive(o, "version");
	files = cJSON_GetObjectItemCaseSensitive(o, "files");
	if (!cJSON_IsString(f) || strcmp(f->valuestring, MANIFEST_FORMAT) ||
	    !cJSON_IsNumber(v) || v->valuedouble != MANIFEST_VERSION ||
	    !cJSON_IsObject(files) || !files->child)
		st = damaged(dir, MANIFEST " is not an opwin manifest", d);
	cJSON_ArrayForEach(e, files)
	{
		if (st == OW_OK)
			st = verify_file(dir, e, d);
	}
	cJSON_Delete(o);
	free(text);
	return st;
}

/* ---- replacing a folder ------------------------------------------------ */

enum ow_status ow_mapdir_check_target(const char *dir, struct ow_diag *d)
{
	char path[OW_PATH_LEN + 32];
	struct stat sb;
	enum ow_status st = ow_io_dir_check(dir, d);
	int n;

	if (st != OW_OK || stat(dir, &sb) != 0)
		return st; /* absent: made when the map is written */
	n = ow_io_dir_count(dir);
	if (n == 0)
		return OW_OK;
	if (ow_mapdir_path(path, sizeof path, dir, MANIFEST, d) == OW_OK &&
	    stat(path, &sb) == 0 && S_ISREG(sb.st_mode))
		return OW_OK;
	if (ow_mapdir_path(path, sizeof path, dir, MD_POINTS_JSON, d) ==
	        OW_OK &&
	    stat(path, &sb) == 0 && S_ISREG(sb.st_mode))
		return OW_OK;
	if (ow_mapdir_path(path, sizeof path, dir, MD_OLD_POINTS_JSON, d) ==
	        OW_OK &&
	    stat(path, &sb) == 0 && S_ISREG(sb.st_mode))
		return OW_OK;
	return ow_diag_set(d, OW_EIO,
	                   "%s: the folder holds files and is not a map "
	                   "folder; opwin writes a map folder whole and "
	                   "replaces it: name a new or empty folder",
	                   dir);
}

/* Entries of the previous folder that are not opwin's move on into the
 * new one. */
static int not_ours(const char *name, void *ctx)
{
	(void)ctx;
	return !is_output_name(name);
}

enum ow_status ow_mapdir_replace(const char *tmp, const char *dir, char *left,
                                 size_t n, struct ow_diag *d)
{
	int old = 0;
	enum ow_status st = ow_io_dir_commit(tmp, dir, &old, d);

	if (left && n)
		left[0] = '\0';
	if (st != OW_OK || !old)
		return st;
	/* the previous folder is now at tmp */
	if (ow_io_dir_remove(tmp, not_ours, NULL, dir) != 0 && left && n)
		snprintf(left, n, "%s", tmp);
	return OW_OK;
}

enum ow_status ow_mapdir_copy_data(const char *from, const char *to,
                                   struct ow_diag *d)
{
	char src[OW_PATH_LEN + 32], dst[OW_PATH_LEN + 32];
	char *list = ow_io_dir_list(from), *name, *nl, *buf = NULL;
	size_t len;
	enum ow_status st =
	    list
	        ? OW_OK
	        : ow_diag_set(d, OW_EINPUT, "%s: cannot list the folder", from);

	for (name = list; st == OW_OK && (nl = strchr(name, '\n'));
	     name = nl + 1) {
		*nl = '\0';
		if (!is_output_name(name) || is_drawing(name) ||
		    !strcmp(name, MANIFEST))
			continue;
		st = ow_mapdir_path(src, sizeof src, from, name, d);
		if (st == OW_OK)
			st = ow_mapdir_path(dst, sizeof dst, to, name, d);
		if (st == OW_OK)
			st = ow_io_read_file(src, MD_MAX_FILE_BYTES, &buf, &len,
			                     d);
		if (st == OW_OK)
			st = ow_io_write_file(dst, buf, len, d);
		free(buf);
		buf = NULL;
	}
	free(list);
	return st;
}
