/* units.c - quantities with units to SI over UDUNITS-2, and the display
 * units people read.
 *
 * Pitfalls of UDUNITS-2 handled here (each seen on Debian 12, 2.2.28):
 * - parsing "200 degC" whole gives 200 K (the offset is lost): the number is
 *   split off first and only the unit text is parsed;
 * - "rpm" is 2 pi rad/min and angles are dimensionless, so "1 Hz" and
 *   "1 rad/s" would both be 1/s: for screw speeds every angle is rewritten
 *   as a fraction of one turn (rev = 1, rad = 1/(2 pi)) before parsing;
 * - "thou", "Wh", "kWh", "BTU", "lbs" are unknown and "hp" is 745.6999 W
 *   (not the exact 745.69987158227 W): rewritten before parsing;
 * - "F" is the farad and "C" the coulomb: temperatures need degF / degC;
 * - an empty unit parses as 1, "mm 2" as 2 mm and "m^0.5" as 5: empty units
 *   and stray numbers are refused here, fractional powers are split off
 *   (consistency "Pa s^n") before UDUNITS sees them;
 * - a failed parse can leave ut_get_status() at success: the returned
 *   pointer is what is tested.
 * - UDUNITS-2 reads numbers (its database, "0.5" in a unit) with strtod,
 *   which follows LC_NUMERIC: every call into it runs under a thread-local
 *   "C" locale (uselocale, POSIX.1-2008), so a decimal comma locale set by
 *   an embedding program changes nothing. opwin itself never calls
 *   setlocale. */
#include "ow_units.h"

#include <errno.h>
#include <locale.h>
#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <udunits2.h>

#include "ow_io.h"
#include "ow_const.h"

#define TEXT_MAX    256  /* longest accepted input text, bytes */
#define UNIT_BUF    1024 /* a unit after alias rewriting */
#define PROBLEM_LEN 256

/* Exact conversion factors, NIST SP 811 (2008), Appendix B.8 / B.9. */
#define IN_M   0.0254          /* inch */
#define FT_M   0.3048          /* foot */
#define LB_KG  0.45359237      /* pound (avoirdupois) */
#define PSI_PA 6894.757293168  /* pound-force per square inch */
#define HP_W   745.69987158227 /* horsepower (550 ft lbf/s) */
#define LBF_N  4.4482216152605 /* pound-force */
#define BTU_J  1055.05585262   /* British thermal unit (IT) */
#define DEGF_K (5.0 / 9.0)     /* one degree Fahrenheit interval, K */
#define TWO_PI 6.28318530717958647692

/* The UDUNITS-2 database, read at the first unit that needs it (reading
 * it is most of the cost of a short command, and the common units of a
 * study never need it: see exact_units). */
struct database {
	ut_system *sys;
	ut_unit *si[OW_DIM_COUNT]; /* the SI unit each dimension converts to */
};

struct ow_units {
	struct database *db; /* filled on first need (ow_units_parse is not
	                        thread-safe anyway) */
	locale_t c_numeric;  /* "C" numbers while UDUNITS-2 reads (it uses
	                        strtod: "0.0254" would read as 0 under a
	                        decimal comma) */
};

/* Units converted without the database: exact factors (SI prefixes; the
 * inch, foot, pound and pound-force by definition, NIST SP 811 (2008)
 * B.8) and offsets (0 degC = 273.15 K, 0 degF = 459.67 degR), matched
 * on the whole unit text as written. Every other text goes to UDUNITS-2. */
struct exact_unit {
	const char *text;
	enum ow_dim dim;
	double factor;
	double offset_K; /* temperatures: SI = factor * (x + offset) */
};

#define DEGF_OFFSET 459.67 /* degF of 0 K */
static const struct exact_unit exact_units[] = {
    {"%", OW_DIM_NONE, 0.01, 0.0},
    {"m", OW_DIM_LENGTH, 1.0, 0.0},
    {"mm", OW_DIM_LENGTH, 1e-3, 0.0},
    {"in", OW_DIM_LENGTH, IN_M, 0.0},
    {"K", OW_DIM_TEMPERATURE, 1.0, 0.0},
    {"degC", OW_DIM_TEMPERATURE, 1.0, OW_ZERO_C_K},
    {"degF", OW_DIM_TEMPERATURE, DEGF_K, DEGF_OFFSET},
    {"K", OW_DIM_TEMP_DIFF, 1.0, 0.0},
    {"degC", OW_DIM_TEMP_DIFF, 1.0, 0.0},
    {"degF", OW_DIM_TEMP_DIFF, DEGF_K, 0.0},
    {"Pa", OW_DIM_PRESSURE, 1.0, 0.0},
    {"kPa", OW_DIM_PRESSURE, 1e3, 0.0},
    {"MPa", OW_DIM_PRESSURE, 1e6, 0.0},
    {"bar", OW_DIM_PRESSURE, 1e5, 0.0},
    {"kg/s", OW_DIM_MASS_FLOW, 1.0, 0.0},
    {"kg/h", OW_DIM_MASS_FLOW, 1.0 / 3600.0, 0.0},
    {"rpm", OW_DIM_ROT_SPEED, 1.0, 0.0},
    {"kg/m3", OW_DIM_DENSITY, 1.0, 0.0},
    {"J/(kg K)", OW_DIM_SPECIFIC_HEAT, 1.0, 0.0},
    {"kJ/(kg K)", OW_DIM_SPECIFIC_HEAT, 1e3, 0.0},
    {"W/(m K)", OW_DIM_CONDUCTIVITY, 1.0, 0.0},
    {"J/kg", OW_DIM_SPECIFIC_ENERGY, 1.0, 0.0},
    {"kJ/kg", OW_DIM_SPECIFIC_ENERGY, 1e3, 0.0},
    {"J/mol", OW_DIM_MOLAR_ENERGY, 1.0, 0.0},
    {"kJ/mol", OW_DIM_MOLAR_ENERGY, 1e3, 0.0},
    {"Pa s", OW_DIM_VISCOSITY, 1.0, 0.0},
    {"s", OW_DIM_TIME, 1.0, 0.0},
    {"W", OW_DIM_POWER, 1.0, 0.0},
    {"kW", OW_DIM_POWER, 1e3, 0.0},
    {"N m", OW_DIM_TORQUE, 1.0, 0.0},
    {"kN m", OW_DIM_TORQUE, 1e3, 0.0},
    {"1/s", OW_DIM_SHEAR_RATE, 1.0, 0.0},
    {"W/(m2 K)", OW_DIM_HEAT_TRANSFER, 1.0, 0.0},
};

/* x in unit (dimension dim) -> *si when the unit is one of exact_units. */
static int exact_to_si(const char *unit, enum ow_dim dim, double x, double *si)
{
	size_t i;

	for (i = 0; i < sizeof exact_units / sizeof exact_units[0]; i++) {
		const struct exact_unit *e = &exact_units[i];

		if (e->dim == dim && strcmp(e->text, unit) == 0) {
			*si = e->factor * (x + e->offset_K);
			return isfinite(*si);
		}
	}
	return 0;
}

/* SI unit of each dimension, as UDUNITS text. Screw speed: turns are
 * rewritten to the number 1, so rev/min is 1/min here. Consistency: only
 * its pressure part goes through UDUNITS. */
static const char *const si_text[OW_DIM_COUNT] = {
    [OW_DIM_NONE] = "1",
    [OW_DIM_LENGTH] = "m",
    [OW_DIM_TEMPERATURE] = "K",
    [OW_DIM_TEMP_DIFF] = "K",
    [OW_DIM_PRESSURE] = "Pa",
    [OW_DIM_MASS_FLOW] = "kg/s",
    [OW_DIM_ROT_SPEED] = "1/min",
    [OW_DIM_DENSITY] = "kg/m3",
    [OW_DIM_SPECIFIC_HEAT] = "J/(kg K)",
    [OW_DIM_CONDUCTIVITY] = "W/(m K)",
    [OW_DIM_SPECIFIC_ENERGY] = "J/kg",
    [OW_DIM_MOLAR_ENERGY] = "J/mol",
    [OW_DIM_VISCOSITY] = "Pa s",
    [OW_DIM_TIME] = "s",
    [OW_DIM_POWER] = "W",
    [OW_DIM_TORQUE] = "N m", /* same dimension as J: both accepted */
    [OW_DIM_SHEAR_RATE] = "1/s",
    [OW_DIM_CONSISTENCY] = "Pa",
    [OW_DIM_HEAT_TRANSFER] = "W/(m2 K)",
};

static const char *const expect_text[OW_DIM_COUNT] = {
    [OW_DIM_NONE] = "a plain number such as \"0.45\" or \"45 %\"",
    [OW_DIM_LENGTH] = "a length such as \"63.5 mm\", \"0.300 in\" or "
                      "\"8 D\"",
    [OW_DIM_TEMPERATURE] = "a temperature such as \"200 degC\", "
                           "\"392 degF\" or \"473.15 K\"",
    [OW_DIM_TEMP_DIFF] = "a temperature difference such as \"+10 K\" or "
                         "\"+18 degF\"",
    [OW_DIM_PRESSURE] = "a pressure such as \"35 MPa\" or \"5000 psi\"",
    [OW_DIM_MASS_FLOW] = "a mass flow such as \"50 kg/h\" or \"110 lb/h\"",
    [OW_DIM_ROT_SPEED] = "a screw speed such as \"60 rpm\" or \"1 rev/s\"",
    [OW_DIM_DENSITY] = "a density such as \"760 kg/m3\" or "
                       "\"47 lb/ft3\"",
    [OW_DIM_SPECIFIC_HEAT] = "a specific heat such as \"2.3 kJ/(kg K)\" "
                             "or \"0.55 BTU/(lb degF)\"",
    [OW_DIM_CONDUCTIVITY] = "a thermal conductivity such as "
                            "\"0.18 W/(m K)\" or \"0.1 BTU/(h ft degF)\"",
    [OW_DIM_SPECIFIC_ENERGY] = "a specific energy such as \"0.2 kWh/kg\" "
                               "or \"720 kJ/kg\"",
    [OW_DIM_MOLAR_ENERGY] = "a molar energy such as \"28 kJ/mol\"",
    [OW_DIM_VISCOSITY] = "a viscosity such as \"9000 Pa s\"",
    [OW_DIM_TIME] = "a time such as \"30 s\" or \"2 min\"",
    [OW_DIM_POWER] = "a power such as \"30 kW\" or \"40 hp\"",
    [OW_DIM_TORQUE] = "a torque such as \"4.8 kN m\" or \"3500 lbf ft\"",
    [OW_DIM_SHEAR_RATE] = "a shear rate such as \"100 1/s\"",
    [OW_DIM_CONSISTENCY] = "a power-law consistency such as "
                           "\"20000 Pa s^0.41\" or \"20 kPa s^n\"",
    [OW_DIM_HEAT_TRANSFER] = "a heat-transfer coefficient such as "
                             "\"2000 W/(m2 K)\" or "
                             "\"350 BTU/(h ft2 degF)\"",
};

struct alias {
	const char *from, *to;
};

/* Symbols UDUNITS-2 lacks or defines otherwise, rewritten in every unit. */
static const struct alias common_alias[] = {
    {"rpm", "(1/min)"}, /* UDUNITS: 2 pi rad/min; a turn counts 1 here */
    {"RPM", "(1/min)"},
    {"rps", "(1/s)"},
    {"thou", "mil"},
    {"Wh", "(W h)"},
    {"kWh", "(kW h)"},
    {"MWh", "(MW h)"},
    {"BTU", "Btu"},
    {"lbs", "lb"},
    {"lbm", "lb"},
    {"hp", "(745.69987158227022 W)"}, /* NIST SP 811 B.9; UDUNITS 745.6999 */
    {"horsepower", "(745.69987158227022 W)"},
    {"°C", "degC"},
    {"°F", "degF"},
    {"℃", "degC"},
    {"℉", "degF"},
};

/* Screw speeds: angles as fractions of one turn (1 rev = 2 pi rad). */
static const struct alias turn_alias[] = {
    {"r", "(1)"}, /* "r/min" */
    {"rev", "(1)"},
    {"revs", "(1)"},
    {"revolution", "(1)"},
    {"revolutions", "(1)"},
    {"turn", "(1)"},
    {"turns", "(1)"},
    {"rotation", "(1)"},
    {"rotations", "(1)"},
    {"cycle", "(1)"},
    {"cycles", "(1)"},
    {"rad", "(0.15915494309189535)"}, /* 1/(2 pi) */
    {"radian", "(0.15915494309189535)"},
    {"radians", "(0.15915494309189535)"},
    {"degree", "(1/360)"},
    {"degrees", "(1/360)"},
    {"°", "(1/360)"}, /* ° alone: an arc degree */
};

#define N_ALIAS(a) (sizeof(a) / sizeof((a)[0]))

/* What one call is about, for its messages. */
struct req {
	const char *text;  /* the input as given, for messages */
	enum ow_dim dim;   /* what the caller asked for */
	double diameter_m; /* > 0 enables "D" */
	struct ow_diag *d;
};

const char *ow_dim_expect(enum ow_dim dim)
{
	if ((int)dim < 0 || dim >= OW_DIM_COUNT)
		return "a value";
	return expect_text[dim];
}

/* OW_EINPUT with "\"<text>\": <problem>; expected <kind such as ...>". */
static enum ow_status reject(const struct req *r, const char *fmt, ...)
    __attribute__((format(printf, 2, 3)));

static enum ow_status reject(const struct req *r, const char *fmt, ...)
{
	char problem[PROBLEM_LEN];
	va_list ap;

	va_start(ap, fmt);
	vsnprintf(problem, sizeof problem, fmt, ap);
	va_end(ap);
	return ow_diag_set(r->d, OW_EINPUT, "\"%.80s\": %s; expected %s",
	                   r->text, problem, ow_dim_expect(r->dim));
}

static enum ow_status load_database(const struct ow_units *u,
                                    struct ow_diag *d);

enum ow_status ow_units_create(struct ow_units **out, struct ow_diag *d)
{
	struct ow_units *u = NULL;
	enum ow_status st = OW_OK;

	if (!out)
		return ow_diag_set(d, OW_EARG, "ow_units_create: out is NULL");
	*out = NULL;
	u = calloc(1, sizeof *u);
	if (u)
		u->db = calloc(1, sizeof *u->db);
	if (!u || !u->db) {
		free(u);
		return ow_diag_set(d, OW_ENOMEM, "units: out of memory");
	}
	u->c_numeric = newlocale(LC_NUMERIC_MASK, "C", (locale_t)0);
	if (u->c_numeric == (locale_t)0) {
		st = ow_diag_set(d, OW_ENOMEM, "units: no C locale");
		goto fail;
	}
	*out = u;
	return OW_OK;
fail:
	ow_units_destroy(u);
	return st;
}

/* Read the XML database and the SI unit of each dimension, with "C"
 * numbers, unless that was done already. */
static enum ow_status load_database(const struct ow_units *u, struct ow_diag *d)
{
	struct database *db = u->db;
	locale_t old;
	enum ow_status st = OW_OK;
	int i;

	if (db->sys)
		return OW_OK;
	old = uselocale(u->c_numeric);
	ut_set_error_message_handler(ut_ignore); /* no printing from lib/ */
	db->sys = ut_read_xml(NULL);
	if (!db->sys) {
		st = ow_diag_set(d, OW_EIO,
		                 "could not read the UDUNITS-2 unit database "
		                 "(status %d; package libudunits2-data, or "
		                 "UDUNITS2_XML_PATH)",
		                 (int)ut_get_status());
		goto done;
	}
	for (i = 0; i < OW_DIM_COUNT; i++) {
		db->si[i] = ut_parse(db->sys, si_text[i], UT_ASCII);
		if (!db->si[i]) {
			st = ow_diag_set(d, OW_ECOMPUTE,
			                 "UDUNITS-2 does not know \"%s\"",
			                 si_text[i]);
			goto done;
		}
	}
done:
	if (st != OW_OK) { /* nothing half-loaded stays behind */
		for (i = 0; i < OW_DIM_COUNT; i++) {
			ut_free(db->si[i]);
			db->si[i] = NULL;
		}
		ut_free_system(db->sys);
		db->sys = NULL;
	}
	uselocale(old);
	return st;
}

void ow_units_destroy(struct ow_units *u)
{
	int i;

	if (!u)
		return;
	for (i = 0; u->db && i < OW_DIM_COUNT; i++)
		ut_free(u->db->si[i]);
	if (u->db)
		ut_free_system(u->db->sys);
	free(u->db);
	if (u->c_numeric != (locale_t)0)
		freelocale(u->c_numeric);
	free(u);
}

/* ---- text helpers (ASCII only: independent of the C locale) ---- */

static int is_space(char c)
{
	return c == ' ' || c == '\t' || c == '\n' || c == '\r' || c == '\v' ||
	       c == '\f';
}

static int is_digit(char c)
{
	return c >= '0' && c <= '9';
}

static int is_alpha(char c)
{
	return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z');
}

/* Copy s without leading and trailing white space into buf[n].
 * Returns 0 when it does not fit. */
static int trim_copy(const char *s, char *buf, size_t n)
{
	size_t len;

	while (is_space(*s))
		s++;
	len = strlen(s);
	while (len > 0 && is_space(s[len - 1]))
		len--;
	if (len >= n)
		return 0;
	memcpy(buf, s, len);
	buf[len] = '\0';
	return 1;
}

/* Length of the decimal number at s: [+-]digits[.digits][(e|E)[+-]digits]
 * with at least one digit; 0 when s does not start with one. An "e" is
 * part of the number only when digits follow it. */
static size_t number_len(const char *s)
{
	size_t i = 0, digits = 0, j;

	if (s[i] == '+' || s[i] == '-')
		i++;
	for (; is_digit(s[i]); i++)
		digits++;
	if (s[i] == '.')
		for (i++; is_digit(s[i]); i++)
			digits++;
	if (digits == 0)
		return 0;
	if (s[i] == 'e' || s[i] == 'E') {
		j = i + 1;
		if (s[j] == '+' || s[j] == '-')
			j++;
		if (is_digit(s[j])) {
			for (i = j; is_digit(s[i]); i++)
				;
		}
	}
	return i;
}

/* strtod of the first len bytes of s, reading '.' as the decimal point
 * whatever LC_NUMERIC says. Sets *x; returns 0 unless finite. */
static int number_value(const char *s, size_t len, double *x)
{
	char buf[TEXT_MAX];
	const char *dp = localeconv()->decimal_point;
	char *dot, *end;

	if (len >= sizeof buf)
		return 0;
	memcpy(buf, s, len);
	buf[len] = '\0';
	dot = strchr(buf, '.');
	if (dot && dp && dp[0] && dp[0] != '.' && !dp[1])
		*dot = dp[0];
	errno = 0;
	*x = strtod(buf, &end);
	return end == buf + len && isfinite(*x);
}

/* Does s start with the lower-case ASCII word w, in any case? */
static int starts_with_word(const char *s, const char *w)
{
	for (; *w; s++, w++)
		if (*s != *w && *s != *w - ('a' - 'A'))
			return 0;
	return 1;
}

/* "nan", "inf", "infinity" (with a sign): named, to say why they fail. */
static int is_non_finite_word(const char *s)
{
	if (*s == '+' || *s == '-')
		s++;
	return starts_with_word(s, "nan") || starts_with_word(s, "inf");
}

enum ow_status ow_units_parse_number(const char *text, double *x,
                                     struct ow_diag *d)
{
	char buf[TEXT_MAX];
	struct req r = {text ? text : "", OW_DIM_NONE, 0.0, d};
	size_t len;

	if (!text || !x)
		return ow_diag_set(d, OW_EARG, "ow_units_parse_number: NULL");
	if (!trim_copy(text, buf, sizeof buf))
		return reject(&r, "too long");
	len = number_len(buf);
	if (len == 0 && is_non_finite_word(buf))
		return reject(&r, "not a finite number");
	if (len == 0 || buf[len] != '\0')
		return reject(&r, "not a number");
	if (!number_value(buf, len, x))
		return reject(&r, "not a finite number (out of range)");
	return OW_OK;
}

/* ---- unit text: tokens, aliases, stray numbers ---- */

/* Bytes of the identifier character at p (a letter, '_', or one of the
 * UTF-8 signs °, µ, μ, ℃, ℉), 0 when p does not start one. */
static size_t ident_char(const char *p)
{
	const unsigned char *s = (const unsigned char *)p;

	if (is_alpha(p[0]) || p[0] == '_')
		return 1;
	if (s[0] == 0xC2 && (s[1] == 0xB0 || s[1] == 0xB5)) /* ° µ */
		return 2;
	if (s[0] == 0xCE && s[1] == 0xBC) /* μ */
		return 2;
	if (s[0] == 0xE2 && s[1] == 0x84 && (s[2] == 0x83 || s[2] == 0x89))
		return 3; /* ℃ ℉ */
	return 0;
}

/* Length of the identifier at p (0 if none). */
static size_t ident_len(const char *p)
{
	size_t n = 0, k;

	while ((k = ident_char(p + n)) > 0)
		n += k;
	return n;
}

static const char *alias_of(const struct alias *a, size_t na, const char *tok,
                            size_t len)
{
	size_t i;

	for (i = 0; i < na; i++)
		if (strlen(a[i].from) == len &&
		    memcmp(a[i].from, tok, len) == 0)
			return a[i].to;
	return NULL;
}

/* Append len bytes of s to out[*pos], keeping room for the NUL. */
static int append(char *out, size_t n, size_t *pos, const char *s, size_t len)
{
	if (*pos + len >= n)
		return 0;
	memcpy(out + *pos, s, len);
	*pos += len;
	out[*pos] = '\0';
	return 1;
}

/* Copy unit into out[n] with every aliased identifier replaced (screw
 * speeds also get the turn aliases). Returns 0 when out is too small. */
static int rewrite_unit(const char *unit, enum ow_dim dim, char *out, size_t n)
{
	size_t pos = 0, len;
	const char *to;

	out[0] = '\0';
	while (*unit) {
		len = ident_len(unit);
		if (len == 0) {
			if (!append(out, n, &pos, unit++, 1))
				return 0;
			continue;
		}
		to = alias_of(common_alias, N_ALIAS(common_alias), unit, len);
		if (!to && dim == OW_DIM_ROT_SPEED)
			to = alias_of(turn_alias, N_ALIAS(turn_alias), unit,
			              len);
		if (!append(out, n, &pos, to ? to : unit,
		            to ? strlen(to) : len))
			return 0;
		unit += len;
	}
	return 1;
}

/* Is word one of the identifiers of unit? */
static int has_token(const char *unit, const char *word)
{
	size_t len;

	while (*unit) {
		len = ident_len(unit);
		if (len == 0) {
			unit++;
			continue;
		}
		if (len == strlen(word) && memcmp(unit, word, len) == 0)
			return 1;
		unit += len;
	}
	return 0;
}

/* A number standing alone inside a unit ("mm 2", "kg*3") would be taken
 * by UDUNITS-2 as a factor; only "1/" (as in "1/s") is a unit. Powers
 * ("m3", "m^3", "s-1", "s**2") follow a letter, '^', '-' or "**". */
static int stray_number(const char *unit)
{
	size_t i;
	char p;

	for (i = 0; unit[i]; i++) {
		if (!is_digit(unit[i]))
			continue;
		if (unit[i] == '1' && unit[i + 1] == '/')
			continue;
		if (i == 0)
			return 1;
		p = unit[i - 1];
		if (is_space(p) || p == '(' || p == '/' || p == '.')
			return 1;
		if (p == '*' && (i < 2 || unit[i - 2] != '*'))
			return 1;
		if (i >= 2 && (unsigned char)unit[i - 2] == 0xC2 &&
		    (unsigned char)p == 0xB7) /* after "·" */
			return 1;
	}
	return 0;
}

/* Why a unit with F or C in it failed: they are farad and coulomb. */
static const char *farad_hint(const char *unit)
{
	if (has_token(unit, "F"))
		return "; use degF (F is the farad)";
	if (has_token(unit, "C"))
		return "; use degC (C is the coulomb)";
	return "";
}

/* ---- conversion ---- */

/* x in unit (already trimmed, not empty) -> SI of dim through UDUNITS-2.
 * Temperature differences convert as cv(x) - cv(0), which drops the
 * offset of degC and degF. */
static enum ow_status udunits_to_si(const struct ow_units *u,
                                    const struct req *r, double x,
                                    const char *unit, enum ow_dim dim,
                                    double *si)
{
	char buf[UNIT_BUF];
	ut_unit *from = NULL;
	cv_converter *cv = NULL;
	enum ow_status st = OW_OK;
	double v;

	if (exact_to_si(unit, dim, x, si))
		return OW_OK;
	if (stray_number(unit))
		return reject(r, "a number inside the unit \"%s\"", unit);
	/* Signs no unit of ours uses (UDUNITS-2 offsets and timestamps with
	 * "@", stray punctuation) and bytes that are not UTF-8 never reach
	 * UDUNITS-2, whose lexer keeps memory on some malformed texts. */
	if (strpbrk(unit, "!\"#$&',:;<=>?@[\\]`{|}~") ||
	    ow_io_utf8_check(unit, strlen(unit)) != strlen(unit))
		return reject(r, "unknown unit \"%s\"", unit);
	if (!rewrite_unit(unit, dim, buf, sizeof buf))
		return reject(r, "unit too long");
	st = load_database(u, r->d);
	if (st != OW_OK)
		return st;
	from = ut_parse(u->db->sys, buf, UT_UTF8); /* test the pointer: the
	                                              status may say
	                                              success */
	if (!from)
		return reject(r, "unknown unit \"%s\"%s", unit,
		              farad_hint(unit));
	if (!ut_are_convertible(from, u->db->si[dim])) {
		st = reject(r, "unit \"%s\" measures something else%s", unit,
		            farad_hint(unit));
		goto done;
	}
	cv = ut_get_converter(from, u->db->si[dim]);
	if (!cv) {
		st = reject(r, "no conversion from \"%s\"", unit);
		goto done;
	}
	v = cv_convert_double(cv, x);
	if (dim == OW_DIM_TEMP_DIFF)
		v -= cv_convert_double(cv, 0.0);
	if (isfinite(v))
		*si = v; /* *si is left alone on every failure */
	else
		st = reject(r, "out of range once converted");
done:
	cv_free(cv);
	ut_free(from);
	return st;
}

/* Where the power of the time part starts: "^", "**" or "ⁿ". */
static const char *power_mark(const char *unit, size_t *mark_len)
{
	const char *p;

	for (p = unit; *p; p++) {
		*mark_len = 1;
		if (*p == '^')
			return p;
		*mark_len = 2;
		if (p[0] == '*' && p[1] == '*')
			return p;
		*mark_len = 0; /* ⁿ is the exponent itself */
		if (strncmp(p, "ⁿ", strlen("ⁿ")) == 0) /* stops at the NUL */
			return p;
	}
	return NULL;
}

/* Is the exponent text "n", "N", a number, or one of those in () or {}? */
static int valid_power(const char *e)
{
	char buf[TEXT_MAX];
	size_t len;

	if (!trim_copy(e, buf, sizeof buf))
		return 0;
	len = strlen(buf);
	if (len >= 2 && ((buf[0] == '(' && buf[len - 1] == ')') ||
	                 (buf[0] == '{' && buf[len - 1] == '}'))) {
		buf[len - 1] = '\0';
		return valid_power(buf + 1);
	}
	if (strcmp(buf, "n") == 0 || strcmp(buf, "N") == 0)
		return 1;
	len = number_len(buf);
	return len > 0 && buf[len] == '\0';
}

/* Bytes of the product sign that ends base[0..end) (" ", ".", "*", "·",
 * "⋅"), 0 when there is none. */
static size_t product_sign_before(const char *base, size_t end)
{
	if (end >= 1 && (is_space(base[end - 1]) || base[end - 1] == '.' ||
	                 base[end - 1] == '*'))
		return 1;
	if (end >= 2 && memcmp(base + end - 2, "·", 2) == 0)
		return 2;
	if (end >= 3 && memcmp(base + end - 3, "⋅", 3) == 0)
		return 3;
	return 0;
}

int ow_units_consistency_power(const char *text, double *power)
{
	char buf[TEXT_MAX], e[TEXT_MAX];
	const char *mark;
	size_t len, mark_len;

	if (!text || !trim_copy(text, buf, sizeof buf))
		return 0;
	mark = power_mark(buf, &mark_len);
	if (!mark) { /* "<pressure> s": the first power */
		*power = 1.0;
		return number_len(buf) > 0;
	}
	if (mark_len == 0 || !valid_power(mark + mark_len) ||
	    !trim_copy(mark + mark_len, e, sizeof e))
		return 0;
	len = strlen(e);
	if (len >= 2 && (e[0] == '(' || e[0] == '{')) { /* "(0.41)" */
		memmove(e, e + 1, len - 2);
		e[len - 2] = '\0';
	}
	len = number_len(e);
	return len > 0 && e[len] == '\0' && number_value(e, len, power);
}

/* Power-law consistency "<pressure unit> s^<n>" -> Pa s^n. The unit of
 * K in tau = K gdot^n (Ostwald 1925; de Waele 1923) is a stress times a
 * time to the power n; with the time in seconds only the stress part
 * converts. Without a power it is "<pressure> s" (n = 1). */
static enum ow_status consistency_to_si(const struct ow_units *u,
                                        const struct req *r, double x,
                                        const char *unit, double *si)
{
	char base[TEXT_MAX], pressure[TEXT_MAX];
	const char *mark;
	size_t mark_len, end, sep;

	mark = power_mark(unit, &mark_len);
	if (!mark)
		return udunits_to_si(u, r, x, unit, OW_DIM_VISCOSITY, si);
	if (mark_len == 0 ? mark[strlen("ⁿ")] != '\0'
	                  : !valid_power(mark + mark_len))
		return reject(r, "the power of s must be n or a number");
	end = (size_t)(mark - unit);
	if (end >= sizeof base)
		return reject(r, "unit too long");
	memcpy(base, unit, end);
	base[end] = '\0';
	while (end > 0 && is_space(base[end - 1]))
		base[--end] = '\0';
	sep = 0;
	if (end >= 1 && base[end - 1] == 's')
		sep = product_sign_before(base, end - 1);
	if (sep > 0)
		base[end - 1 - sep] = '\0'; /* keep the pressure part */
	if (sep == 0 || !trim_copy(base, pressure, sizeof pressure) ||
	    pressure[0] == '\0')
		return reject(r, "the time part must be seconds, as in "
		                 "\"Pa s^n\"");
	return udunits_to_si(u, r, x, pressure, OW_DIM_PRESSURE, si);
}

/* x in unit (trimmed; may be empty) -> SI of r->dim, numbers read "C". */
static enum ow_status unit_to_si_c(const struct ow_units *u,
                                   const struct req *r, double x,
                                   const char *unit, double *si)
{
	int temp = r->dim == OW_DIM_TEMPERATURE || r->dim == OW_DIM_TEMP_DIFF;

	if (unit[0] == '\0') {
		if (r->dim != OW_DIM_NONE)
			return reject(r, "missing unit");
		*si = x;
		return OW_OK;
	}
	if (r->dim == OW_DIM_LENGTH && strcmp(unit, "D") == 0) {
		if (!(r->diameter_m > 0.0))
			return reject(r, "a length in diameters (D) needs "
			                 "the screw diameter");
		*si = x * r->diameter_m;
		return OW_OK;
	}
	if (temp && (strcmp(unit, "F") == 0 || strcmp(unit, "C") == 0))
		return reject(r, "%s", farad_hint(unit) + 2);
	if (r->dim == OW_DIM_CONSISTENCY)
		return consistency_to_si(u, r, x, unit, si);
	return udunits_to_si(u, r, x, unit, r->dim, si);
}

/* unit_to_si_c under a thread-local "C" LC_NUMERIC (see the top). */
static enum ow_status unit_to_si(const struct ow_units *u, const struct req *r,
                                 double x, const char *unit, double *si)
{
	locale_t old = uselocale(u->c_numeric);
	enum ow_status st = unit_to_si_c(u, r, x, unit, si);

	uselocale(old);
	return st;
}

static int bad_call(const struct ow_units *u, enum ow_dim dim, const void *a,
                    const void *b)
{
	return !u || !a || !b || (int)dim < 0 || dim >= OW_DIM_COUNT;
}

enum ow_status ow_units_parse(const struct ow_units *u, const char *text,
                              enum ow_dim dim, double diameter_m, double *si,
                              struct ow_diag *d)
{
	char buf[TEXT_MAX];
	struct req r = {text, dim, diameter_m, d};
	size_t len;
	double x;

	if (bad_call(u, dim, text, si))
		return ow_diag_set(d, OW_EARG, "ow_units_parse: bad argument");
	if (!trim_copy(text, buf, sizeof buf))
		return reject(&r, "too long");
	if (buf[0] == '\0')
		return reject(&r, "no value");
	len = number_len(buf);
	if (len == 0)
		return reject(&r, is_non_finite_word(buf)
		                      ? "not a finite number"
		                      : "no number before the unit");
	if (!number_value(buf, len, &x))
		return reject(&r, "not a finite number (out of range)");
	while (is_space(buf[len]))
		len++;
	return unit_to_si(u, &r, x, buf + len, si);
}

enum ow_status ow_units_convert(const struct ow_units *u, double x,
                                const char *unit, enum ow_dim dim, double *si,
                                struct ow_diag *d)
{
	char text[TEXT_MAX + 32], buf[TEXT_MAX];
	struct req r = {text, dim, 0.0, d};

	if (bad_call(u, dim, unit, si))
		return ow_diag_set(d, OW_EARG,
		                   "ow_units_convert: bad argument");
	snprintf(text, sizeof text, "%.15g %s", x, unit);
	if (!isfinite(x))
		return reject(&r, "not a finite number");
	if (!trim_copy(unit, buf, sizeof buf))
		return reject(&r, "unit too long");
	return unit_to_si(u, &r, x, buf, si);
}

enum ow_status ow_unit_system_parse(const char *s, enum ow_unit_system *out)
{
	if (!s || !out)
		return OW_EARG;
	if (strcmp(s, "si") == 0 || strcmp(s, "SI") == 0) {
		*out = OW_SYS_SI;
		return OW_OK;
	}
	if (strcmp(s, "us") == 0 || strcmp(s, "US") == 0) {
		*out = OW_SYS_US;
		return OW_OK;
	}
	return OW_EARG;
}

/* ---- display ---- */

/* shown = (si - si_zero) / scale + shown_zero; scale is SI per shown unit. */
struct shown_unit {
	double scale, si_zero, shown_zero;
	const char *label; /* UTF-8 */
};

/* Factors: NIST SP 811 (2008) Appendix B.8/B.9 (see the #defines above). */
static const struct shown_unit shown_units[2][OW_DIM_COUNT] =
    {
        [OW_SYS_SI] =
            {
                [OW_DIM_NONE] = {1.0, 0.0, 0.0, ""},
                [OW_DIM_LENGTH] = {1e-3, 0.0, 0.0, "mm"},
                [OW_DIM_TEMPERATURE] = {1.0, OW_ZERO_C_K, 0.0, "°C"},
                [OW_DIM_TEMP_DIFF] = {1.0, 0.0, 0.0, "K"},
                [OW_DIM_PRESSURE] = {1e6, 0.0, 0.0, "MPa"},
                [OW_DIM_MASS_FLOW] = {1.0 / 3600.0, 0.0, 0.0, "kg/h"},
                [OW_DIM_ROT_SPEED] = {1.0, 0.0, 0.0, "rpm"},
                [OW_DIM_DENSITY] = {1.0, 0.0, 0.0, "kg/m³"},
                [OW_DIM_SPECIFIC_HEAT] = {1e3, 0.0, 0.0, "kJ/(kg·K)"},
                [OW_DIM_CONDUCTIVITY] = {1.0, 0.0, 0.0, "W/(m·K)"},
                [OW_DIM_SPECIFIC_ENERGY] = {3.6e6, 0.0, 0.0, "kWh/kg"},
                [OW_DIM_MOLAR_ENERGY] = {1e3, 0.0, 0.0, "kJ/mol"},
                [OW_DIM_VISCOSITY] = {1.0, 0.0, 0.0, "Pa·s"},
                [OW_DIM_TIME] = {1.0, 0.0, 0.0, "s"},
                [OW_DIM_POWER] = {1e3, 0.0, 0.0, "kW"},
                [OW_DIM_TORQUE] = {1.0, 0.0, 0.0, "N·m"},
                [OW_DIM_SHEAR_RATE] = {1.0, 0.0, 0.0, "1/s"},
                [OW_DIM_CONSISTENCY] = {1.0, 0.0, 0.0, "Pa·sⁿ"},
                [OW_DIM_HEAT_TRANSFER] = {1.0, 0.0, 0.0, "W/(m²·K)"},
            },
        [OW_SYS_US] =
            {
                [OW_DIM_NONE] = {1.0, 0.0, 0.0, ""},
                [OW_DIM_LENGTH] = {IN_M, 0.0, 0.0, "in"},
                [OW_DIM_TEMPERATURE] = {DEGF_K, OW_ZERO_C_K, 32.0, "°F"},
                [OW_DIM_TEMP_DIFF] = {DEGF_K, 0.0, 0.0, "°F"},
                [OW_DIM_PRESSURE] = {PSI_PA, 0.0, 0.0, "psi"},
                [OW_DIM_MASS_FLOW] = {LB_KG / 3600.0, 0.0, 0.0, "lb/h"},
                [OW_DIM_ROT_SPEED] = {1.0, 0.0, 0.0, "rpm"},
                [OW_DIM_DENSITY] = {LB_KG / (FT_M * FT_M * FT_M), 0.0, 0.0,
                                    "lb/ft³"},
                [OW_DIM_SPECIFIC_HEAT] = {BTU_J / (LB_KG * DEGF_K), 0.0, 0.0,
                                          "BTU/(lb·°F)"},
                [OW_DIM_CONDUCTIVITY] = {BTU_J / (3600.0 * FT_M * DEGF_K), 0.0,
                                         0.0, "BTU/(h·ft·°F)"},
                [OW_DIM_SPECIFIC_ENERGY] = {HP_W * 3600.0 / LB_KG, 0.0, 0.0,
                                            "hp·h/lb"},
                [OW_DIM_MOLAR_ENERGY] = {1e3, 0.0, 0.0, "kJ/mol"},
                [OW_DIM_VISCOSITY] = {1.0, 0.0, 0.0, "Pa·s"},
                [OW_DIM_TIME] = {1.0, 0.0, 0.0, "s"},
                [OW_DIM_POWER] = {HP_W, 0.0, 0.0, "hp"},
                [OW_DIM_TORQUE] = {LBF_N * FT_M, 0.0, 0.0, "lbf·ft"},
                [OW_DIM_SHEAR_RATE] = {1.0, 0.0, 0.0, "1/s"},
                [OW_DIM_CONSISTENCY] = {1.0, 0.0, 0.0, "Pa·sⁿ"},
                [OW_DIM_HEAT_TRANSFER] = {BTU_J /
                                              (3600.0 * FT_M * FT_M * DEGF_K),
                                          0.0, 0.0, "BTU/(h·ft²·°F)"},
            },
};

static const struct shown_unit *shown_unit_of(enum ow_unit_system sys,
                                              enum ow_dim dim)
{
	if ((int)sys < 0 || sys > OW_SYS_US || (int)dim < 0 ||
	    dim >= OW_DIM_COUNT)
		return NULL;
	return &shown_units[sys][dim];
}

double ow_display_value(enum ow_unit_system sys, enum ow_dim dim, double si)
{
	const struct shown_unit *s = shown_unit_of(sys, dim);

	return s ? (si - s->si_zero) / s->scale + s->shown_zero : NAN;
}

double ow_display_to_si(enum ow_unit_system sys, enum ow_dim dim, double shown)
{
	const struct shown_unit *s = shown_unit_of(sys, dim);

	return s ? (shown - s->shown_zero) * s->scale + s->si_zero : NAN;
}

const char *ow_display_label(enum ow_unit_system sys, enum ow_dim dim)
{
	const struct shown_unit *s = shown_unit_of(sys, dim);

	return s ? s->label : "";
}
