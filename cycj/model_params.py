"""Slots of the plain float64 model-parameter array handed to the compiled kernels.

This module is the only place the layout is defined; :func:`cycj.life.model_array` fills it.
"""

(E_MOD, E_PRIME, SIGMA_Y, K_CYC, N_CYC, K_PEAK, N_PEAK, FLOW_RATIO, LR_MAX, J_C, C_LAW, M_LAW,
 DJ_TH, Q_TOUGH, J_METHOD, CLOSURE, U_CONST, ALPHA_NEWMAN, INCLUDE_COMP, FAD_CURVE,
 CHECK_TOUGH, CHECK_FAD, CHECK_COLLAPSE, A_LIMIT, A_TEAR, N_MODEL) = range(26)
N_MP = 32

