/* ow_status.h - error codes and the diagnostic buffer shared by every module.
 *
 * Every fallible call returns enum ow_status and takes an optional
 * struct ow_diag * (NULL allowed) that receives the message of the FIRST
 * failure only, so the root cause is never overwritten by a consequence.
 * There is no global error state: the solver runs in many threads at once. */
#ifndef OW_STATUS_H
#define OW_STATUS_H

/* One list, so codes and messages cannot drift apart. Append only. */
#define OW_STATUS_LIST(X)                                                      \
	X(OW_OK, "success")                                                    \
	X(OW_EINPUT, "inputs rejected")                                        \
	X(OW_ENOMEM, "out of memory")                                          \
	X(OW_EIO, "file could not be read or written")                         \
	X(OW_ECOMPUTE, "computation failed")                                   \
	X(OW_ENOCONV, "iteration did not converge")                            \
	X(OW_EARG, "invalid argument")

enum ow_status {
#define OW_STATUS_ENUM(name, text) name,
	OW_STATUS_LIST(OW_STATUS_ENUM)
#undef OW_STATUS_ENUM
	    OW_STATUS_COUNT
};

#define OW_DIAG_LEN 512

/* Detail of the first failure: "file: json.path: what was expected". */
struct ow_diag {
	char msg[OW_DIAG_LEN];
};

/* Short English text for a status code; never NULL. */
const char *ow_strerror(enum ow_status st);

/* Record a printf-style message in d unless d is NULL or already holds one.
 * Returns st so callers can write `return ow_diag_set(d, OW_EINPUT, ...)`. */
enum ow_status ow_diag_set(struct ow_diag *d, enum ow_status st,
                           const char *fmt, ...)
    __attribute__((format(printf, 3, 4)));

/* Empty the buffer (so a later failure can be recorded). NULL-safe. */
void ow_diag_clear(struct ow_diag *d);

#endif
