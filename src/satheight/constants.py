"""Physical constants and unit factors, each with its source.

All values are SI. Unit factors convert *from* the named unit *to* SI.
"""

from __future__ import annotations

import math

#: Standard acceleration of gravity [m/s^2]. 3rd CGPM (1901); NIST SP 811 (2008).
STANDARD_GRAVITY = 9.80665

#: International foot [m]. NIST SP 811 (2008), Appendix B.
FOOT = 0.3048

#: Pound-force per square inch [Pa]. NIST SP 811 (2008), Appendix B
#: (0.45359237 kg * 9.80665 m/s^2 / 0.0254^2 m^2).
PSI = 0.45359237 * STANDARD_GRAVITY / 0.0254**2

#: Darcy [m^2]. NIST SP 811 (2008), Appendix B: 1 darcy = 9.869233e-13 m^2.
DARCY = 9.869233e-13

#: Millidarcy [m^2].
MILLIDARCY = DARCY * 1e-3

#: Dyne per centimetre [N/m] (= 1 mN/m). CGS definition.
DYNE_PER_CM = 1e-3

#: Gram per cubic centimetre [kg/m^3].
G_PER_CM3 = 1000.0

#: Pound-mass per cubic foot [kg/m^3]. NIST SP 811 (2008), Appendix B.
LB_PER_FT3 = 0.45359237 / FOOT**3

#: Constant of the Leverett J-function in field units,
#: J = C * Pc[psi] * sqrt(k[mD] / phi) / (sigma*cos(theta))[dyn/cm].
#: Derived from the SI form J = Pc * sqrt(k/phi) / (sigma cos theta):
#: C = PSI * sqrt(MILLIDARCY) / DYNE_PER_CM = 0.216601 (textbooks print 0.2166).
J_FIELD_CONSTANT = PSI * math.sqrt(MILLIDARCY) / DYNE_PER_CM
