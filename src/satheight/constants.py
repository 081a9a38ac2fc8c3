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

#: US survey foot [m]: 1200/3937 m exactly. NIST SP 811 (2008), Appendix B (footnote on the
#: survey foot); scipy.constants.survey_foot.
US_SURVEY_FOOT = 1200.0 / 3937.0

#: Standard atmosphere [Pa], the offset between gauge and absolute pressure used here.
#: NIST SP 811 (2008), Appendix B: 1 atm = 101 325 Pa exactly.
STANDARD_ATMOSPHERE = 101325.0

#: Kilogram-force per square centimetre [Pa]: 9.80665 N / 1e-4 m^2 = 98 066.5 Pa exactly.
#: NIST SP 811 (2008), Appendix B.
KGF_PER_CM2 = STANDARD_GRAVITY / 1e-4

#: US liquid gallon [m^3]: 231 in^3 = 3.785411784e-3 m^3 exactly. NIST SP 811 (2008), App. B.
US_GALLON = 231 * 0.0254**3

#: Pound-mass per US gallon [kg/m^3] (mud weight "ppg"): 0.45359237 kg / US gallon
#: = 119.826 427 kg/m^3. NIST SP 811 (2008), Appendix B.
LB_PER_GALLON = 0.45359237 / US_GALLON

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
