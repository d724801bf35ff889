package element

// Shorthands for the hazard column.
const (
	tox = Toxic
	brn = ReadilyBurning
	rad = Radioactive
)

// table holds Z = 1-94, one row per element, in the field order of Element:
//
//	Z, Symbol, Name, AtomicWeight, Electronegativity, MetallicRadiusCN12,
//	ValenceElectrons, Group, Density, SpecificHeat, ThermalConductivity, Hazards
//
// A zero means "not tabulated here". Sources, column by column:
//
// AtomicWeight (g/mol): CIAAW, "Standard atomic weights of the elements 2021",
// T. Prohaska et al., Pure Appl. Chem. 94, 573 (2022) (doi:10.1515/pac-2019-0603,
// from memory), as listed on ciaaw.org. Where the 2021 table gives a single value it is
// typed in full (uncertainty dropped); where it gives an interval (H, Li, B,
// C, N, O, Mg, Si, S, Cl, Ar, Br, Tl, Pb) the CIAAW abridged five-figure
// value is used. Elements without a standard atomic weight carry the mass
// number of their longest-lived isotope (Tc 97, Pm 145, Po 209, At 210,
// Rn 222, Fr 223, Ra 226, Ac 227, Np 237, Pu 244) and the Radioactive
// hazard; Th, Pa and U have standard atomic weights and are radioactive too.
// Z = 1-53 were checked against the ciaaw.org 2021 listing; Z = 54-94 are
// typed from memory of the same table. All rows are cross-checked against
// pymatgen and periodictable in the tests.
//
// Electronegativity (Pauling scale): the Allred (1961) revision of Pauling's
// values, A. L. Allred, J. Inorg. Nucl. Chem. 17, 215 (1961), as reproduced
// in the CRC Handbook of Chemistry and Physics; from memory. Where an element
// has values for several oxidation states the handbook's headline value is
// used (Sn 1.96, Pb 2.33, Tl 1.62, Fe 1.83, Cu 1.90). Allred gives no value
// for Pm, Eu, Tb and Yb; the values here (1.13, 1.2, 1.1, 1.1) are the
// commonly quoted estimates (from memory) and are rougher than the rest.
// Kr 3.00 and Xe 2.60 come from the CRC listing; He, Ne, Ar and Rn have none.
//
// MetallicRadiusCN12 (Å): metallic radii for 12-fold coordination after
// E. T. Teatum, K. A. Gschneidner Jr. and J. T. Waber, Los Alamos report
// LA-4003 (1968), as reproduced in W. B. Pearson, The Crystal Chemistry and
// Physics of Metals and Alloys (Wiley, 1972); from memory. Each value was
// sanity-checked against half the nearest-neighbour distance from the room
// temperature lattice constants (fcc: a/(2√2); hcp: mean of a/2 and the
// out-of-plane contact; bcc: a√3/4 raised by the usual ~3 % CN8→CN12
// correction), which agree to about 0.005 Å. Left zero: non-metals and
// noble gases, Hg (liquid), As, Se, Te, Po, Pm and the actinides after Th
// except Ac, whose published CN12 values could not be confirmed. Si, Ge, Sb
// and Bi are the Pearson estimates for a hypothetical close-packed form and
// are rougher (±0.02 Å).
//
// ValenceElectrons (VEC count): s+d electrons outside the noble-gas core for
// groups 1-12 (the group number), s+p for groups 13-18 (group number − 10;
// He 2). Lanthanides count the three conduction electrons of the trivalent
// metal (5d¹6s²), except Eu and Yb which are divalent in the metal (4f⁷ and
// 4f¹⁴ cores) and count 2. Actinides count all electrons outside the radon
// core (Ac 3, Th 4, Pa 5, U 6, Np 7, Pu 8), because the 5f electrons of the
// light actinides are itinerant. Reference: common practice (VEC as used
// for high-entropy and complex alloys).
//
// Group: IUPAC groups 1-18; 0 for La-Lu and Ac-Pu.
//
// Density (kg/m³, solid at 20-25 °C; Hg and Br liquid), SpecificHeat
// (J/(kg·K), cp at 25 °C) and ThermalConductivity (W/(m·K), 300 K): CRC
// Handbook of Chemistry and Physics tables "Physical constants of inorganic
// compounds", "Heat capacity of the elements at 25 °C" and "Thermal
// conductivity of the elements"; from memory. Gases carry none of the
// three. Carbon is graphite (conductivity left zero: it differs by two
// orders of magnitude along and across the layers); phosphorus is white
// phosphorus; Te and Se conductivities are left zero for the same
// anisotropy reason. Radioactive elements carry only what is measured
// (no heat capacity for Tc, Pm, Pa, Np, Pu; nothing for Po-Fr).
//
// Hazards (bench cautions, a judgement, not a regulatory classification):
//   - Toxic: Be, Cd, Hg, Pb, Tl, As (dust, vapour or fume poisonous); Se, Te
//     and Sb (their oxide fumes from melts are poisonous); Co and Ni (dust
//     and fume are sensitising and carcinogenic); Os (powder forms volatile
//     OsO₄ in air); Br (vapour); Po (an alpha emitter, lethal in traces).
//   - ReadilyBurning: the alkali metals Li-Cs and alkaline earths Mg-Ba
//     (react with air or water, burn as chips or vapour); Sc, Y and La-Lu
//     (fines and turnings ignite, Ce and Eu fastest); Ti, Zr and Hf (fines,
//     turnings, sponge and grinding dust are pyrophoric); Th, U and Pu
//     (pyrophoric fines); red or white phosphorus. Aluminium is not
//     flagged: its powder burns, but the lumps and shot weighed out for
//     melting do not ignite readily.
//   - Radioactive: every element with no stable isotope, Tc, Pm and Po-Pu.
//     Bi-209 decays with a half-life of ~10¹⁹ years and Bi is treated as
//     stable.
var table = []Element{
	{1, "H", "hydrogen", 1.0080, 2.20, 0, 1, 1, 0, 0, 0, 0},
	{2, "He", "helium", 4.002602, 0, 0, 2, 18, 0, 0, 0, 0},
	{3, "Li", "lithium", 6.94, 0.98, 1.562, 1, 1, 534, 3582, 84.8, brn},
	{4, "Be", "beryllium", 9.0121831, 1.57, 1.128, 2, 2, 1848, 1825, 200, tox},
	{5, "B", "boron", 10.81, 2.04, 0, 3, 13, 2340, 1026, 27.4, 0},
	{6, "C", "carbon", 12.011, 2.55, 0, 4, 14, 2267, 709, 0, 0},
	{7, "N", "nitrogen", 14.007, 3.04, 0, 5, 15, 0, 0, 0, 0},
	{8, "O", "oxygen", 15.999, 3.44, 0, 6, 16, 0, 0, 0, 0},
	{9, "F", "fluorine", 18.998403162, 3.98, 0, 7, 17, 0, 0, 0, 0},
	{10, "Ne", "neon", 20.1797, 0, 0, 8, 18, 0, 0, 0, 0},
	{11, "Na", "sodium", 22.98976928, 0.93, 1.911, 1, 1, 968, 1228, 142, brn},
	{12, "Mg", "magnesium", 24.305, 1.31, 1.602, 2, 2, 1738, 1023, 156, brn},
	{13, "Al", "aluminium", 26.9815384, 1.61, 1.432, 3, 13, 2698, 897, 237, 0},
	{14, "Si", "silicon", 28.085, 1.90, 1.319, 4, 14, 2329, 705, 149, 0},
	{15, "P", "phosphorus", 30.973761998, 2.19, 0, 5, 15, 1823, 769, 0.236, brn},
	{16, "S", "sulfur", 32.06, 2.58, 0, 6, 16, 2070, 710, 0, 0},
	{17, "Cl", "chlorine", 35.45, 3.16, 0, 7, 17, 0, 0, 0, 0},
	{18, "Ar", "argon", 39.95, 0, 0, 8, 18, 0, 0, 0, 0},
	{19, "K", "potassium", 39.0983, 0.82, 2.376, 1, 1, 862, 757, 102.5, brn},
	{20, "Ca", "calcium", 40.078, 1.00, 1.974, 2, 2, 1550, 647, 201, brn},
	{21, "Sc", "scandium", 44.955907, 1.36, 1.641, 3, 3, 2985, 568, 15.8, brn},
	{22, "Ti", "titanium", 47.867, 1.54, 1.462, 4, 4, 4506, 523, 21.9, brn},
	{23, "V", "vanadium", 50.9415, 1.63, 1.346, 5, 5, 6110, 489, 30.7, 0},
	{24, "Cr", "chromium", 51.9961, 1.66, 1.282, 6, 6, 7190, 449, 93.9, 0},
	{25, "Mn", "manganese", 54.938043, 1.55, 1.264, 7, 7, 7300, 479, 7.81, 0},
	{26, "Fe", "iron", 55.845, 1.83, 1.274, 8, 8, 7874, 449, 80.4, 0},
	{27, "Co", "cobalt", 58.933194, 1.88, 1.252, 9, 9, 8900, 421, 100, tox},
	{28, "Ni", "nickel", 58.6934, 1.91, 1.246, 10, 10, 8908, 444, 90.9, tox},
	{29, "Cu", "copper", 63.546, 1.90, 1.278, 11, 11, 8960, 385, 401, 0},
	{30, "Zn", "zinc", 65.38, 1.65, 1.394, 12, 12, 7134, 388, 116, 0},
	{31, "Ga", "gallium", 69.723, 1.81, 1.411, 3, 13, 5904, 371, 40.6, 0},
	{32, "Ge", "germanium", 72.630, 2.01, 1.369, 4, 14, 5323, 320, 60.2, 0},
	{33, "As", "arsenic", 74.921595, 2.18, 0, 5, 15, 5727, 329, 50.2, tox},
	{34, "Se", "selenium", 78.971, 2.55, 0, 6, 16, 4810, 321, 0, tox},
	{35, "Br", "bromine", 79.904, 2.96, 0, 7, 17, 3103, 474, 0.122, tox},
	{36, "Kr", "krypton", 83.798, 3.00, 0, 8, 18, 0, 0, 0, 0},
	{37, "Rb", "rubidium", 85.4678, 0.82, 2.546, 1, 1, 1532, 363, 58.2, brn},
	{38, "Sr", "strontium", 87.62, 0.95, 2.151, 2, 2, 2640, 301, 35.4, brn},
	{39, "Y", "yttrium", 88.905838, 1.22, 1.801, 3, 3, 4472, 298, 17.2, brn},
	{40, "Zr", "zirconium", 91.224, 1.33, 1.602, 4, 4, 6520, 278, 22.7, brn},
	{41, "Nb", "niobium", 92.90637, 1.6, 1.468, 5, 5, 8570, 265, 53.7, 0},
	{42, "Mo", "molybdenum", 95.95, 2.16, 1.400, 6, 6, 10280, 251, 138, 0},
	{43, "Tc", "technetium", 97, 1.9, 1.360, 7, 7, 11500, 0, 50.6, rad},
	{44, "Ru", "ruthenium", 101.07, 2.2, 1.339, 8, 8, 12370, 238, 117, 0},
	{45, "Rh", "rhodium", 102.90549, 2.28, 1.345, 9, 9, 12410, 243, 150, 0},
	{46, "Pd", "palladium", 106.42, 2.20, 1.376, 10, 10, 12023, 246, 71.8, 0},
	{47, "Ag", "silver", 107.8682, 1.93, 1.445, 11, 11, 10490, 235, 429, 0},
	{48, "Cd", "cadmium", 112.414, 1.69, 1.568, 12, 12, 8650, 232, 96.6, tox},
	{49, "In", "indium", 114.818, 1.78, 1.663, 3, 13, 7310, 233, 81.8, 0},
	{50, "Sn", "tin", 118.710, 1.96, 1.623, 4, 14, 7287, 228, 66.8, 0},
	{51, "Sb", "antimony", 121.760, 2.05, 1.59, 5, 15, 6697, 207, 24.4, tox},
	{52, "Te", "tellurium", 127.60, 2.1, 0, 6, 16, 6240, 202, 0, tox},
	{53, "I", "iodine", 126.90447, 2.66, 0, 7, 17, 4933, 214, 0.449, 0},
	{54, "Xe", "xenon", 131.293, 2.60, 0, 8, 18, 0, 0, 0, 0},
	{55, "Cs", "caesium", 132.90545196, 0.79, 2.731, 1, 1, 1873, 242, 35.9, brn},
	{56, "Ba", "barium", 137.327, 0.89, 2.243, 2, 2, 3620, 204, 18.4, brn},
	{57, "La", "lanthanum", 138.90547, 1.10, 1.877, 3, 0, 6145, 195, 13.4, brn},
	{58, "Ce", "cerium", 140.116, 1.12, 1.825, 3, 0, 6770, 192, 11.3, brn},
	{59, "Pr", "praseodymium", 140.90766, 1.13, 1.828, 3, 0, 6773, 193, 12.5, brn},
	{60, "Nd", "neodymium", 144.242, 1.14, 1.821, 3, 0, 7007, 190, 16.5, brn},
	{61, "Pm", "promethium", 145, 1.13, 0, 3, 0, 7260, 0, 0, rad},
	{62, "Sm", "samarium", 150.36, 1.17, 1.802, 3, 0, 7520, 197, 13.3, brn},
	{63, "Eu", "europium", 151.964, 1.2, 2.042, 2, 0, 5243, 182, 13.9, brn},
	{64, "Gd", "gadolinium", 157.25, 1.20, 1.802, 3, 0, 7895, 236, 10.6, brn},
	{65, "Tb", "terbium", 158.925354, 1.1, 1.782, 3, 0, 8229, 182, 11.1, brn},
	{66, "Dy", "dysprosium", 162.500, 1.22, 1.773, 3, 0, 8550, 170, 10.7, brn},
	{67, "Ho", "holmium", 164.930329, 1.23, 1.766, 3, 0, 8795, 165, 16.2, brn},
	{68, "Er", "erbium", 167.259, 1.24, 1.757, 3, 0, 9066, 168, 14.5, brn},
	{69, "Tm", "thulium", 168.934219, 1.25, 1.746, 3, 0, 9321, 160, 16.9, brn},
	{70, "Yb", "ytterbium", 173.045, 1.1, 1.940, 2, 0, 6965, 155, 38.5, brn},
	{71, "Lu", "lutetium", 174.9668, 1.27, 1.734, 3, 0, 9841, 154, 16.4, brn},
	{72, "Hf", "hafnium", 178.486, 1.3, 1.580, 4, 4, 13310, 144, 23.0, brn},
	{73, "Ta", "tantalum", 180.94788, 1.5, 1.467, 5, 5, 16650, 140, 57.5, 0},
	{74, "W", "tungsten", 183.84, 2.36, 1.408, 6, 6, 19250, 132, 173, 0},
	{75, "Re", "rhenium", 186.207, 1.9, 1.375, 7, 7, 21020, 137, 47.9, 0},
	{76, "Os", "osmium", 190.23, 2.2, 1.352, 8, 8, 22590, 130, 87.6, tox},
	{77, "Ir", "iridium", 192.217, 2.20, 1.357, 9, 9, 22560, 131, 147, 0},
	{78, "Pt", "platinum", 195.084, 2.28, 1.387, 10, 10, 21450, 133, 71.6, 0},
	{79, "Au", "gold", 196.966570, 2.54, 1.442, 11, 11, 19300, 129, 318, 0},
	{80, "Hg", "mercury", 200.592, 2.00, 0, 12, 12, 13534, 140, 8.30, tox},
	{81, "Tl", "thallium", 204.38, 1.62, 1.716, 3, 13, 11850, 129, 46.1, tox},
	{82, "Pb", "lead", 207.2, 2.33, 1.750, 4, 14, 11340, 129, 35.3, tox},
	{83, "Bi", "bismuth", 208.98040, 2.02, 1.70, 5, 15, 9780, 122, 7.97, 0},
	{84, "Po", "polonium", 209, 2.0, 0, 6, 16, 0, 0, 0, rad | tox},
	{85, "At", "astatine", 210, 2.2, 0, 7, 17, 0, 0, 0, rad},
	{86, "Rn", "radon", 222, 0, 0, 8, 18, 0, 0, 0, rad},
	{87, "Fr", "francium", 223, 0.7, 0, 1, 1, 0, 0, 0, rad},
	{88, "Ra", "radium", 226, 0.9, 0, 2, 2, 5000, 0, 0, rad},
	{89, "Ac", "actinium", 227, 1.1, 1.878, 3, 0, 10070, 120, 12, rad},
	{90, "Th", "thorium", 232.0377, 1.3, 1.798, 4, 0, 11724, 113, 54.0, rad | brn},
	{91, "Pa", "protactinium", 231.03588, 1.5, 0, 5, 0, 15370, 0, 47, rad},
	{92, "U", "uranium", 238.02891, 1.38, 0, 6, 0, 19050, 116, 27.5, rad | brn},
	{93, "Np", "neptunium", 237, 1.36, 0, 7, 0, 20450, 0, 6.3, rad},
	{94, "Pu", "plutonium", 244, 1.28, 0, 8, 0, 19816, 0, 6.74, rad | brn},
}
