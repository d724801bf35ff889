"""Families of reflections and |F|² by gemmi for the powder tests.

Input on stdin (JSON): {"dmin": Å, "files": [{"path": CIF, "u": {label: U Å²}}]}.
For each file: gemmi reads the CIF, takes the space group from its symbol
(gemmi's own operation table; the Hall symbol or number when the file
gives no Hermann-Mauguin symbol), sets each site's U to the given value (no
anisotropic U), lists every hkl with d ≥ dmin, drops those
is_systematically_absent() reports, merges the rest into Laue-class
families from gemmi's rotations (apply_to_hkl, plus Friedel mates) and
computes F of the representative with StructureFactorCalculatorX (IT92 form
factors, no anomalous dispersion). Output (JSON) on stdout.
"""
import json, math, sys
import gemmi

req = json.load(sys.stdin)
out = []
for item in req['files']:
    ss = gemmi.read_small_structure(item['path'])
    for site in ss.sites:
        site.u_iso = item['u'][site.label]
        site.aniso = gemmi.SMat33d(0, 0, 0, 0, 0, 0)
    sg = ss.find_spacegroup()
    if sg is None:
        # no Hermann-Mauguin symbol: the Hall symbol, else the number
        block = gemmi.cif.read(item['path']).sole_block()
        hall = block.find_value('_space_group_name_Hall') or block.find_value('_symmetry_space_group_name_Hall')
        number = block.find_value('_space_group_IT_number') or block.find_value('_symmetry_Int_Tables_number')
        if hall:
            sg = gemmi.find_spacegroup_by_ops(gemmi.symops_from_hall(gemmi.cif.as_string(hall)))
        elif number:
            sg = gemmi.find_spacegroup_by_number(gemmi.cif.as_int(number))
    ss.spacegroup_hm = sg.xhm()
    ss.setup_cell_images()
    ss.change_occupancies_to_crystallographic()
    ops = sg.operations()
    rots = [op.rot for op in ops.sym_ops]
    cell = ss.cell
    dmin = req['dmin']
    lim = [int(cell.a / dmin) + 1, int(cell.b / dmin) + 1, int(cell.c / dmin) + 1]
    calc = gemmi.StructureFactorCalculatorX(cell)
    seen = set()
    fams = []
    for h in range(-lim[0], lim[0] + 1):
        for k in range(-lim[1], lim[1] + 1):
            for l in range(-lim[2], lim[2] + 1):
                hkl = (h, k, l)
                if hkl == (0, 0, 0) or hkl in seen:
                    continue
                d = cell.calculate_d(list(hkl))
                if d < dmin:
                    continue
                orbit = set()
                for op in ops.sym_ops:
                    m = tuple(op.apply_to_hkl(list(hkl)))
                    orbit.add(m)
                    orbit.add((-m[0], -m[1], -m[2]))
                seen |= orbit
                if ops.is_systematically_absent(list(hkl)):
                    continue
                rep = min(orbit, key=lambda x: (sum(1 for v in x if v < 0), [-v for v in x]))
                f = calc.calculate_sf_from_small_structure(ss, list(rep))
                fams.append({'hkl': rep, 'mult': len(orbit), 'd': d, 'f2': abs(f) ** 2})
    out.append({'path': item['path'], 'group': sg.xhm(), 'families': fams})
json.dump(out, sys.stdout)
