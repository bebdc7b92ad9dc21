/* doc_unicode.c - a correct ToUnicode map for the PDF's fonts, so that
 * text can be searched and copied (also "°C", "–", "≤").
 *
 * libharu's UTF-8 encoder writes every character as its two-byte Unicode
 * code point through the Identity-H encoding, but names its encoding CMap
 * (a CID map with "begincidrange") as the font's /ToUnicode, which a
 * reader must reject ("Invalid 'begincidrange' operator in ToUnicode
 * CMap"). The finished file gets an incremental update (PDF 32000-1:2008,
 * 7.5.6): one new ToUnicode CMap stream that maps every two-byte code to
 * the same code point (bfrange, 7.10.3 and Adobe Technical Note #5411,
 * section 1.4.1; one range per high byte, surrogates left out), each font
 * dictionary again with its /ToUnicode pointing there, a cross-reference
 * section for those objects and a trailer with /Prev. The bytes before
 * the update are left as they were. */
#include "doc_impl.h"

#include "ow_io.h"

#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#define MAX_FONTS 16

static void putf(struct ow_buf *b, const char *fmt, ...)
    __attribute__((format(printf, 2, 3)));

static void putf(struct ow_buf *b, const char *fmt, ...)
{
	char tmp[256];
	va_list ap;
	int k;

	va_start(ap, fmt);
	k = vsnprintf(tmp, sizeof tmp, fmt, ap);
	va_end(ap);
	if (k > 0)
		ow_buf_add(b, tmp,
		           (size_t)k < sizeof tmp ? (size_t)k : sizeof tmp - 1);
}

/* The last occurrence of needle in the n bytes at h, or NULL. */
static const unsigned char *last(const unsigned char *h, size_t n,
                                 const char *needle)
{
	size_t k = strlen(needle), i;

	for (i = n >= k ? n - k + 1 : 0; i-- > 0;)
		if (!memcmp(h + i, needle, k))
			return h + i;
	return NULL;
}

static const unsigned char *find(const unsigned char *h, size_t n,
                                 const char *needle)
{
	size_t k = strlen(needle), i;

	for (i = 0; i + k <= n; i++)
		if (!memcmp(h + i, needle, k))
			return h + i;
	return NULL;
}

/* The identity ToUnicode CMap: code point = code, 248 ranges. */
static void cmap(struct ow_buf *b)
{
	int h, k = 0, n = 0;

	ow_buf_adds(
	    b, "/CIDInit /ProcSet findresource begin\n12 dict begin\n"
	       "begincmap\n/CIDSystemInfo << /Registry (Adobe) /Ordering "
	       "(UCS) /Supplement 0 >> def\n/CMapName /Adobe-Identity-UCS "
	       "def\n/CMapType 2 def\n1 begincodespacerange\n<0000> <FFFF>\n"
	       "endcodespacerange\n");
	for (h = 0; h < 256; h++) {
		if (h >= 0xD8 && h <= 0xDF)
			continue; /* surrogates: no characters */
		if (k == 0) {
			n = 248 - (h > 0xDF ? h - 8 : h);
			n = n > 100 ? 100 : n;
			putf(b, "%d beginbfrange\n", n);
		}
		putf(b, "<%02X00> <%02XFF> <%02X00>\n", h, h, h);
		if (++k == n) {
			ow_buf_adds(b, "endbfrange\n");
			k = 0;
		}
	}
	ow_buf_adds(b,
	            "endcmap\nCMapName currentdict /CMap defineresource pop\n"
	            "end\nend\n");
}

/* Font objects naming a /ToUnicode: their numbers and dictionaries. */
struct font {
	int num;
	size_t dict, ref;     /* offsets: after "obj", of "/ToUnicode" */
	size_t dict_n, ref_n; /* up to "endobj"; "/ToUnicode n 0 R" */
};

static int fonts(const unsigned char *p, size_t n, struct font *f)
{
	const unsigned char *q = p, *end = p + n;
	int k = 0;

	while (k < MAX_FONTS &&
	       (q = find(q, (size_t)(end - q), "/ToUnicode ")) != NULL) {
		const unsigned char *o = last(p, (size_t)(q - p), " 0 obj");
		const unsigned char *e = find(q, (size_t)(end - q), "endobj");
		const unsigned char *s = o, *r = q + 11;

		if (!o || !e)
			break;
		while (s > p && s[-1] >= '0' && s[-1] <= '9')
			s--;
		f[k].num = atoi((const char *)s);
		f[k].dict = (size_t)(o + 6 - p);
		f[k].dict_n = (size_t)(e - (o + 6));
		f[k].ref = (size_t)(q - p);
		while (r < end && *r != 'R')
			r++;
		f[k].ref_n = (size_t)(r + 1 - q);
		k++;
		q = e;
	}
	return k;
}

/* "/Name <digits> 0 R" from the trailer, into out ("" when absent). */
static void trailer_ref(const unsigned char *t, size_t n, const char *name,
                        char *out, size_t m)
{
	const unsigned char *q = find(t, n, name);
	size_t k = 0;

	out[0] = '\0';
	if (!q)
		return;
	q += strlen(name);
	while (q < t + n && *q == ' ')
		q++;
	while (q < t + n && *q != '/' && *q != '>' && *q != '\r' &&
	       *q != '\n' && k + 1 < m)
		out[k++] = (char)*q++;
	out[k] = '\0';
}

enum ow_status ow_doc_fix_to_unicode(unsigned char **buf, size_t *len,
                                     struct ow_diag *d)
{
	struct font f[MAX_FONTS];
	struct ow_buf b = {(char *)*buf, *len, *len, 0};
	size_t old_len = *len;
	const unsigned char *tr = last(*buf, *len, "trailer");
	const unsigned char *sx = last(*buf, *len, "startxref");
	char root[32], info[32];
	size_t off[MAX_FONTS + 1], xref, body_n;
	int nf = fonts(*buf, *len, f), size, prev, k;
	unsigned char *body;

	if (!nf || !tr || !sx)
		return OW_OK; /* nothing to mend */
	trailer_ref(tr, (size_t)(sx - tr), "/Root", root, sizeof root);
	trailer_ref(tr, (size_t)(sx - tr), "/Info", info, sizeof info);
	{
		const unsigned char *s = find(tr, (size_t)(sx - tr), "/Size ");

		size = s ? atoi((const char *)s + 6) : 0;
	}
	prev = atoi((const char *)sx + 9);
	if (size <= 0 || prev <= 0 || !*root)
		return OW_OK;
	/* the new objects refer into the old bytes: copy those first */
	body_n = 0;
	for (k = 0; k < nf; k++)
		body_n += f[k].dict_n + 32;
	body = malloc(body_n + 1);
	if (!body)
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	ow_buf_add(&b, "\n",
	           1); /* b.data may move from here on: offsets only */
	off[0] = b.len;
	{
		struct ow_buf c = {0};

		cmap(&c);
		putf(&b, "%d 0 obj\n<< /Length %zu >>\nstream\n", size, c.len);
		if (!c.oom)
			ow_buf_add(&b, c.data, c.len);
		b.oom |= c.oom;
		ow_buf_free(&c);
		ow_buf_adds(&b, "\nendstream\nendobj\n");
	}
	for (k = 0; k < nf; k++) {
		size_t a = f[k].ref - f[k].dict, z = a + f[k].ref_n;

		off[k + 1] = b.len;
		putf(&b, "%d 0 obj", f[k].num);
		if (b.oom)
			break;
		/* copied out first: an add may move b.data */
		memcpy(body, b.data + f[k].dict, a);
		ow_buf_add(&b, body, a);
		putf(&b, "/ToUnicode %d 0 R", size);
		if (b.oom)
			break;
		memcpy(body, b.data + f[k].dict + z, f[k].dict_n - z);
		ow_buf_add(&b, body, f[k].dict_n - z);
		ow_buf_adds(&b, "endobj\n");
	}
	xref = b.len;
	putf(&b, "xref\n%d 1\n%010zu 00000 n\r\n", size, off[0]);
	for (k = 0; k < nf; k++)
		putf(&b, "%d 1\n%010zu 00000 n\r\n", f[k].num, off[k + 1]);
	putf(&b, "trailer\n<<\n/Root %s\n", root);
	if (*info)
		putf(&b, "/Info %s\n", info);
	putf(&b, "/Size %d\n/Prev %d\n>>\nstartxref\n%zu\n%%%%EOF\n", size + 1,
	     prev, xref);
	free(body);
	if (b.oom) { /* b.data still holds the document as it was */
		*buf = (unsigned char *)b.data;
		*len = old_len;
		return ow_diag_set(d, OW_ENOMEM, "out of memory");
	}
	*buf = (unsigned char *)b.data;
	*len = b.len;
	return OW_OK;
}
