package store

import (
	"database/sql"
	"fmt"
	"math"
	"strings"

	"meltbook"
)

// phaseKinds are the kinds an indexed phase may have: the two
// quasicrystal models and the seven crystal systems.
var phaseKinds = []string{meltbook.ModelIcosahedral, meltbook.ModelApproximant, meltbook.ModelCubic,
	meltbook.ModelTetragonal, meltbook.ModelHexagonal, meltbook.ModelOrthorhombic, meltbook.ModelMonoclinic,
	meltbook.ModelTriclinic, meltbook.ModelRhombohedral}

// phaseLattices are the centrings an indexed phase may have.
var phaseLattices = []string{"P", "I", "F", "A", "B", "C", "R"}

func oneOf(v string, set []string) bool {
	for _, s := range set {
		if v == s {
			return true
		}
	}
	return false
}

// checkPhase checks an indexed phase before it is written, naming the
// field at fault by its name in the document: the kind and centring are
// ones the notebook holds, every number is finite, the chance is a
// probability, cell constants and angles are either not given (0, with no
// uncertainty) or positive (angles below 180°) with an uncertainty ≥ 0, an
// Rwp is ≥ 0, and each assignment's numbers are finite with a predicted
// intensity ≥ 0. The assignments
// checked are the phase's own (AddScan); a document's are checked apart.
func checkPhase(ph *meltbook.IndexedPhase) error {
	if !oneOf(ph.Kind, phaseKinds) {
		return meltbook.Errorf(invalid, "kind", "%q is not one of %s", ph.Kind, strings.Join(phaseKinds, ", "))
	}
	if !oneOf(ph.Lattice, phaseLattices) {
		return meltbook.Errorf(invalid, "lattice", "%q is not one of the centrings %s", ph.Lattice, strings.Join(phaseLattices, ", "))
	}
	for _, f := range []struct {
		name string
		v    float64
	}{
		{"ideal_a_angstrom", ph.IdealAA}, {"constant_angstrom", ph.ConstantA}, {"constant_su_angstrom", ph.ConstantSUA},
		{"a6_angstrom", ph.SixDimensionalConstantA}, {"zero_shift_deg", ph.ZeroShiftDeg}, {"zero_shift_su_deg", ph.ZeroShiftSUDeg},
		{"figure_of_merit", ph.FigureOfMerit}, {"explained_intensity", ph.ExplainedIntensity}, {"rms_residual_deg", ph.RMSResidualDeg},
	} {
		if math.IsNaN(f.v) || math.IsInf(f.v, 0) {
			return meltbook.Errorf(invalid, f.name, "%g is not a finite number", f.v)
		}
	}
	if !(ph.Chance >= 0 && ph.Chance <= 1) {
		return meltbook.Errorf(invalid, "chance", "%g is not a probability", ph.Chance)
	}
	for _, c := range []struct {
		what, name, suName string
		v, su, max         float64
		unit, want         string
	}{
		{"b", "b_angstrom", "b_su_angstrom", ph.ConstantB, ph.ConstantSUB, math.Inf(1), " Å", "positive"},
		{"c", "c_angstrom", "c_su_angstrom", ph.ConstantC, ph.ConstantSUC, math.Inf(1), " Å", "positive"},
		{"α", "alpha_deg", "alpha_su_deg", ph.AlphaDeg, ph.AlphaSUDeg, 180, "°", "between 0° and 180°"},
		{"β", "beta_deg", "beta_su_deg", ph.BetaDeg, ph.BetaSUDeg, 180, "°", "between 0° and 180°"},
		{"γ", "gamma_deg", "gamma_su_deg", ph.GammaDeg, ph.GammaSUDeg, 180, "°", "between 0° and 180°"},
	} {
		switch {
		case c.v != 0 && !(c.v > 0 && c.v < c.max):
			return meltbook.Errorf(invalid, c.name, "%s = %g%s is not %s", c.what, c.v, c.unit, c.want)
		case !(c.su >= 0) || math.IsInf(c.su, 0):
			return meltbook.Errorf(invalid, c.suName, "%g%s is not a standard uncertainty (finite, ≥ 0)", c.su, c.unit)
		case c.v == 0 && c.su != 0:
			return meltbook.Errorf(invalid, c.suName, "an uncertainty of %g%s is given for %s, which the phase does not give", c.su, c.unit, c.what)
		}
	}
	if r := ph.WholePatternRwp; r != nil && !(*r >= 0 && !math.IsInf(*r, 0)) {
		return meltbook.Errorf(invalid, "whole_pattern_rwp", "%g is not an Rwp (finite, ≥ 0)", *r)
	}
	for j := range ph.Assignments {
		a := &ph.Assignments[j]
		if err := checkAssignment(a.CalculatedTwoThetaDeg, a.ResidualDeg, a.DAngstrom, a.PredictedIntensity); err != nil {
			return at(fmt.Sprintf("assignments[%d]", j), err)
		}
	}
	return nil
}

// checkAssignment checks an assignment's numbers: finite, and a predicted
// intensity, when given, ≥ 0.
func checkAssignment(calculatedDeg, residualDeg, dA float64, predicted *float64) error {
	for _, f := range []struct {
		name string
		v    float64
	}{{"calculated_two_theta_deg", calculatedDeg}, {"residual_deg", residualDeg}, {"d_angstrom", dA}} {
		if math.IsNaN(f.v) || math.IsInf(f.v, 0) {
			return meltbook.Errorf(invalid, f.name, "%g is not a finite number", f.v)
		}
	}
	return checkPredictedIntensity(predicted)
}

func checkPredictedIntensity(v *float64) error {
	if v != nil && !(*v >= 0 && !math.IsInf(*v, 0)) {
		return meltbook.Errorf(invalid, "predicted_intensity", "%g is not a relative intensity (finite, ≥ 0)", *v)
	}
	return nil
}

// cellNull stores a cell constant or angle the kind fixes (0) as NULL, and
// its uncertainty with it.
func cellNull(v, su float64) (value, uncertainty any) {
	if v == 0 {
		return nil, nil
	}
	return v, su
}

// insertPhase writes an indexed phase of indexing indexingID at position;
// id nil asks for a new row id. It returns the row id.
func (t *txn) insertPhase(id any, indexingID int64, position int, ph *meltbook.IndexedPhase) (int64, error) {
	b, bSU := cellNull(ph.ConstantB, ph.ConstantSUB)
	c, cSU := cellNull(ph.ConstantC, ph.ConstantSUC)
	alpha, alphaSU := cellNull(ph.AlphaDeg, ph.AlphaSUDeg)
	beta, betaSU := cellNull(ph.BetaDeg, ph.BetaSUDeg)
	gamma, gammaSU := cellNull(ph.GammaDeg, ph.GammaSUDeg)
	return t.insert(`INSERT INTO indexed_phase (id, indexing_id, position, kind, lattice, approximant_order, approximant_of,
			ideal_a_angstrom, phase, space_group, structure_reference, constant_angstrom, constant_su_angstrom,
			b_angstrom, b_su_angstrom, c_angstrom, c_su_angstrom, alpha_deg, alpha_su_deg, beta_deg, beta_su_deg,
			gamma_deg, gamma_su_deg, a6_angstrom, zero_shift_deg, zero_shift_su_deg, figure_of_merit, chance,
			chance_basis, explained_intensity, rms_residual_deg, phason_strain, whole_pattern_rwp)
		VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?) RETURNING id`,
		id, indexingID, position, ph.Kind, ph.Lattice, ph.Order, ph.ApproximantOf,
		zeroNull(ph.IdealAA), ph.Phase, ph.SpaceGroup, ph.Reference, ph.ConstantA, ph.ConstantSUA,
		b, bSU, c, cSU, alpha, alphaSU, beta, betaSU,
		gamma, gammaSU, zeroNull(ph.SixDimensionalConstantA), ph.ZeroShiftDeg, ph.ZeroShiftSUDeg, ph.FigureOfMerit, ph.Chance,
		ph.ChanceBasis, ph.ExplainedIntensity, ph.RMSResidualDeg, boolInt(ph.PhasonStrain), nullFloat(ph.WholePatternRwp))
}

// phaseColumns are the columns scanPhase reads, of indexed_phase.
const phaseColumns = `id, kind, lattice, approximant_order, approximant_of, ideal_a_angstrom, phase, space_group,
	structure_reference, constant_angstrom, constant_su_angstrom, b_angstrom, b_su_angstrom, c_angstrom, c_su_angstrom,
	alpha_deg, alpha_su_deg, beta_deg, beta_su_deg, gamma_deg, gamma_su_deg, a6_angstrom, zero_shift_deg,
	zero_shift_su_deg, figure_of_merit, chance, chance_basis, explained_intensity, rms_residual_deg, phason_strain,
	whole_pattern_rwp`

// scanPhase reads phaseColumns into ph (without its assignments).
func scanPhase(row interface{ Scan(...any) error }, ph *meltbook.IndexedPhase) error {
	var ideal, a6, b, bSU, c, cSU, alpha, alphaSU, beta, betaSU, gamma, gammaSU, rwp sql.NullFloat64
	var phason int
	if err := row.Scan(&ph.ID, &ph.Kind, &ph.Lattice, &ph.Order, &ph.ApproximantOf, &ideal, &ph.Phase, &ph.SpaceGroup,
		&ph.Reference, &ph.ConstantA, &ph.ConstantSUA, &b, &bSU, &c, &cSU,
		&alpha, &alphaSU, &beta, &betaSU, &gamma, &gammaSU, &a6, &ph.ZeroShiftDeg,
		&ph.ZeroShiftSUDeg, &ph.FigureOfMerit, &ph.Chance, &ph.ChanceBasis, &ph.ExplainedIntensity, &ph.RMSResidualDeg, &phason,
		&rwp); err != nil {
		return err
	}
	ph.IdealAA, ph.SixDimensionalConstantA, ph.PhasonStrain = ideal.Float64, a6.Float64, phason == 1
	ph.ConstantB, ph.ConstantSUB, ph.ConstantC, ph.ConstantSUC = b.Float64, bSU.Float64, c.Float64, cSU.Float64
	ph.AlphaDeg, ph.AlphaSUDeg, ph.BetaDeg, ph.BetaSUDeg = alpha.Float64, alphaSU.Float64, beta.Float64, betaSU.Float64
	ph.GammaDeg, ph.GammaSUDeg = gamma.Float64, gammaSU.Float64
	ph.WholePatternRwp = floatPtr(rwp)
	return nil
}

// insertAssignment writes which reflection of phase phaseID explains peak
// peakID.
func (t *txn) insertAssignment(phaseID, peakID int64, calculatedDeg, residualDeg, dA float64, label, detail string, predicted *float64) error {
	_, err := t.exec(`INSERT INTO peak_assignment (phase_id, peak_id, calculated_two_theta_deg, residual_deg, d_angstrom, label,
			detail, predicted_intensity) VALUES (?, ?, ?, ?, ?, ?, ?, ?)`,
		phaseID, peakID, calculatedDeg, residualDeg, dA, label, detail, nullFloat(predicted))
	return err
}

// insertModel writes the best solution of one model tried by indexing
// indexingID, at position.
func (t *txn) insertModel(indexingID int64, position int, m meltbook.ModelTried) error {
	_, err := t.exec(`INSERT INTO indexing_model (indexing_id, position, kind, lattice, approximant_order, phase, scale_angstrom,
			indexed_peaks, figure_of_merit, chance) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
		indexingID, position, m.Kind, m.Lattice, m.Order, m.Phase, m.ScaleA, m.IndexedPeaks, m.FigureOfMerit, m.Chance)
	return err
}

// modelColumns are the columns scanModel reads, of indexing_model.
const modelColumns = `kind, lattice, approximant_order, phase, scale_angstrom, indexed_peaks, figure_of_merit, chance`

func scanModel(row interface{ Scan(...any) error }, m *meltbook.ModelTried) error {
	return row.Scan(&m.Kind, &m.Lattice, &m.Order, &m.Phase, &m.ScaleA, &m.IndexedPeaks, &m.FigureOfMerit, &m.Chance)
}
