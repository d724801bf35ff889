"""Powder patterns by pymatgen for the powder tests.

Input on stdin (JSON): {"wavelength": Å, "two_theta_max": degrees,
"files": [CIF paths]}. For each file pymatgen's CifParser reads the first
structure as given (conventional cell, its own symmetry expansion) and
XRDCalculator(wavelength) computes the pattern from 0 to two_theta_max
with no Debye-Waller factors (U = 0), intensities scaled to 100 for the
strongest line, lines merged by 2θ within pymatgen's own tolerance.
Output (JSON) on stdout: per file the number of atoms in the cell (sum of
occupancies), 2θ and intensities.
"""
import json
import sys
import warnings

warnings.simplefilter('ignore')

from pymatgen.io.cif import CifParser
from pymatgen.analysis.diffraction.xrd import XRDCalculator

req = json.load(sys.stdin)
calc = XRDCalculator(wavelength=req['wavelength'])
out = []
for path in req['files']:
    try:
        s = CifParser(path).get_structures(primitive=False)[0]
    except Exception as e:
        out.append({'path': path, 'error': str(e)})
        continue
    p = calc.get_pattern(s, scaled=True, two_theta_range=(0, req['two_theta_max']))
    out.append({'path': path, 'atoms': float(s.composition.num_atoms), 'two_theta': [float(x) for x in p.x], 'intensity': [float(y) for y in p.y]})
json.dump(out, sys.stdout)
