"""Slots of the plain float64 model-parameter array handed to the compiled kernels.

This module is the only place the layout is defined; :func:`cycj.life.model_array` fills it.
"""

(
    E_MOD,
    E_PRIME,
    SIGMA_Y,
    K_CYC,
    N_CYC,
    K_PEAK,
    N_PEAK,
    FLOW_RATIO,
    LR_MAX,
    J_C,
    C_LAW,
    M_LAW,
    DJ_TH,
    Q_TOUGH,
    J_METHOD,
    CLOSURE,
    U_CONST,
    ALPHA_NEWMAN,
    INCLUDE_COMP,
    FAD_CURVE,
    CHECK_TOUGH,
    CHECK_FAD,
    CHECK_COLLAPSE,
    A_LIMIT,
    A_TEAR,
    SEQ_MODEL,
    SEQ_EXPONENT,
    SEQ_SHUT_OFF,
    ZONE_BETA,
    TWO_D,
    LEAK_SIZE,
    ASPECT_MAX,
    C_LIMIT,
    CH_MODE,
    CH_N,
    CH_A_LO,
    CH_A_HI,
    CH_THICKNESS,
    NOTCH_KT,
    NOTCH_DEPTH,
    NOTCH_OWN_LONG,
    CH_C_LO,
    CH_C_HI,
    CH_SURFACE,
    CH_WIDTH,
) = range(45)
#: membrane and bending stress per unit value of each load channel (up to MAX_CHANNELS)
MAX_CHANNELS = 6
CH_PM = 45
CH_PB = CH_PM + MAX_CHANNELS
#: 1.0 for a channel whose stress is secondary (in K and ρ, never in L_r), e.g. thermal
CH_SECONDARY = CH_PB + MAX_CHANNELS
#: critical crack size under the history's peak load [mm] and the end code of the criterion
#: that sets it: a cycle whose growth would carry the crack past it ends there, on that
#: criterion (``inf`` and END_SIZE when unknown)
A_CRIT = CH_SECONDARY + MAX_CHANNELS
CRIT_CODE = A_CRIT + 1
#: loop invariants, filled once by cycj.life.model_array (the stepper reads them instead of
#: recomputing them each cycle): the cyclic yield K'·0.002^n' [MPa], 1/n', the exponent
#: 1 + 1/n' of the plastic fraction, 1/n of the peak curve, and Newman's α terms
#: 0.825 − 0.34α + 0.05α², 0.415 − 0.071α and 1/α
SY_CYC = CRIT_CODE + 1
INV_N_CYC = SY_CYC + 1
PF_EXP = INV_N_CYC + 1
INV_N_PEAK = PF_EXP + 1
NEWMAN_C0 = INV_N_PEAK + 1
NEWMAN_C1 = NEWMAN_C0 + 1
INV_ALPHA = NEWMAN_C1 + 1
N_MP = INV_ALPHA + 1
#: finite-element J table (j_method "finite-element", cycj.fe.lookup): number of crack sizes,
#: levels per size, then the table itself; cycj.life.model_array appends them (from FE_NA on)
#: only for that method, so they lie beyond the base length N_MP
FE_NA = N_MP
FE_NL = FE_NA + 1
FE_TABLE = FE_NL + 1

# crack-state slots (float64 array carried between compiled calls)
(ST_A, ST_C, ST_CYCLES, ST_BLOCKS, ST_A_OL, ST_Z_OL, ST_K_OL) = range(7)
N_STATE = 8
