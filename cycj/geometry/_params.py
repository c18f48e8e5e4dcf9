"""Layout of the plain float64 parameter array that geometry kernels receive.

Kernels know nothing of names; this module is the only place the slots are defined.
"""

N_PARAMS = 10
WIDTH = 0  # W [mm] (full width for plates; from the load line for C(T)); 0 if infinite
THICKNESS = 1  # B [mm]
NET_THICKNESS = 2  # B_N [mm] (side-grooved); equals B when not grooved
SPAN = 3  # S [mm] (three-point bend)
PLANE_STRAIN = 4  # 1.0 plane strain, 0.0 plane stress
HALF_LENGTH = 5  # c [mm] (surface crack)
BENDING_RATIO = 6  # bending over membrane stress (surface crack)
EXTRA = 7  # inner radius R_i [mm] (pressurised cylinder)
HOLE_RADIUS = 8  # R [mm] (crack at a hole)
CRACKS = 9  # number of cracks at the hole (1 or 2)

#: von Mises constraint factor on a plane-strain net-section limit load (common practice)
PLANE_STRAIN_FACTOR = 1.1547005383792517  # 2/sqrt(3)
