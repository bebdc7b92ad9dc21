/* ow_const.h - the mathematical and physical constants, written once. It
 * includes nothing, so every layer may use it. */
#ifndef OW_CONST_H
#define OW_CONST_H

#define OW_PI           3.14159265358979323846
#define OW_ZERO_C_K     273.15      /* 0 degC in K (ISO 80000-5) */
#define OW_GAS_CONSTANT 8.314462618 /* J/(mol K), CODATA 2018 */

#endif
