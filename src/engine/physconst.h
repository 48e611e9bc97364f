/* physconst.h - physical constants used by the device models.
 *
 * Both are exact by definition since the 2019 redefinition of the SI
 * (CODATA 2018 recommended values). */
#ifndef BR_ENGINE_PHYSCONST_H
#define BR_ENGINE_PHYSCONST_H

#define BR_BOLTZMANN 1.380649e-23  /* Boltzmann constant k, J/K */
#define BR_ECHARGE 1.602176634e-19 /* elementary charge q, C */
#define BR_KELVIN_OFFSET 273.15    /* 0 degC in kelvin */

#endif
