# Builds powder patterns for the wholepattern tests from a model that is not
# the one the package fits: pymatgen's XRDCalculator gives the peak
# positions and intensities of structures built here, every line is a true
# Voigt (scipy.special.voigt_profile), the background is an exponential plus
# a parabola, and the counts are Poisson draws from numpy with a fixed seed.
# Prints one JSON object on standard output.
import json
import math

import numpy as np
from scipy.special import voigt_profile
from pymatgen.core import Lattice, Structure
from pymatgen.analysis.diffraction.xrd import XRDCalculator

# Cu Kα1 and Kα2 in Å: Hölzer et al., Phys. Rev. A 56, 4554 (1997).
L1, L2 = 1.5405929, 1.5444274
RATIO = 0.5  # I(Kα2)/I(Kα1), common practice
ZERO = 0.030  # zero shift put into the data, degrees 2θ
# Gaussian width of every line: Caglioti form, degrees² (chosen here).
GU, GV, GW = 0.006, -0.003, 0.004
LFRAC = 0.5  # Lorentzian FWHM as a fraction of the Gaussian FWHM (chosen here)

x = np.round(np.arange(20.0, 120.0 + 1e-9, 0.02), 6)

structures = {
    # fcc Al, a = 4.0495 Å (NIST-like value, from memory)
    "al": Structure(Lattice.cubic(4.0495), ["Al"] * 4,
                    [[0, 0, 0], [0.5, 0.5, 0], [0.5, 0, 0.5], [0, 0.5, 0.5]]),
    # hcp Mg, a = 3.2094 Å, c = 5.2108 Å (from memory)
    "mg": Structure.from_spacegroup("P6_3/mmc", Lattice.hexagonal(3.2094, 5.2108),
                                    ["Mg"], [[1 / 3, 2 / 3, 0.25]]),
    # θ-Al2Cu, I4/mcm, a = 6.067 Å, c = 4.877 Å, Cu 4a, Al 8h x = 0.158
    # (from memory)
    "al2cu": Structure.from_spacegroup("I4/mcm", Lattice.tetragonal(6.067, 4.877),
                                       ["Cu", "Al"], [[0, 0, 0.25], [0.158, 0.658, 0]]),
    # diamond Si, a = 5.431 Å (from memory): the wrong phase
    "si": Structure.from_spacegroup("Fd-3m", Lattice.cubic(5.431), ["Si"], [[0, 0, 0]]),
}

calc = XRDCalculator(wavelength=L1)
peaks = {}
reflections = {}
for name, s in structures.items():
    pat = calc.get_pattern(s, scaled=True, two_theta_range=(10, 135))
    peaks[name] = list(zip(pat.y, pat.d_hkls))
    refl = []
    for fams in pat.hkls:
        for f in fams:
            h = f["hkl"]
            if len(h) == 4:  # Miller-Bravais (h k i l) -> (h k l)
                h = (h[0], h[1], h[3])
            refl.append([int(h[0]), int(h[1]), int(h[2]), int(f["multiplicity"])])
    reflections[name] = refl


def line(center, theta, area):
    t = math.tan(theta)
    fg = math.sqrt(GU * t * t + GV * t + GW)
    fl = LFRAC * fg
    sigma = fg / (2 * math.sqrt(2 * math.log(2)))
    return area * voigt_profile(x - center, sigma, fl / 2)


def pattern(parts, doublet=True):
    y = 180 + 250 * np.exp(-(x - 20) / 18) + 0.004 * (x - 70) ** 2
    lines = ((L1, 1.0), (L2, RATIO)) if doublet else ((L1, 1.0),)
    for name, scale in parts:
        for inten, d in peaks[name]:
            for lam, r in lines:
                s = lam / (2 * d)
                if s >= 1:
                    continue
                th = math.asin(s)
                y = y + line(2 * math.degrees(th) + ZERO, th, scale * r * inten)
    return y


rng = np.random.default_rng(20261204)
out = {"x": x.tolist(), "reflections": reflections, "patterns": {}}
for key, parts in {
    "al": [("al", 4.0)],
    "mg": [("mg", 4.0)],
    "al2cu": [("al2cu", 4.0)],
    "almg": [("al", 2.4), ("mg", 2.0)],
}.items():
    out["patterns"][key] = rng.poisson(pattern(parts)).astype(float).tolist()
# Kα1 only, as behind a monochromator.
out["patterns"]["al_mono"] = rng.poisson(pattern([("al", 4.0)], doublet=False)).astype(float).tolist()
print(json.dumps(out))
