package intake

import (
	"bytes"
	"context"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"path/filepath"
	"strings"

	"meltbook"
	"meltbook/analysis/peaks"
	"meltbook/analysis/radiation"
	"meltbook/analysis/scanfile"
	"meltbook/analysis/verdict"
	"meltbook/store"
)

// Program names the intake as the runner of indexings and the proposer of
// automatic outcomes in the notebook.
const Program = "meltbook intake 1"

// DefaultNeighbourDistance is the composition distance within which other
// melts' samples count as neighbours (an atomic fraction).
const DefaultNeighbourDistance = 0.02

// File is one scan file to add to a sample.
type File struct {
	// Sample is the code of the sample the scan was taken of.
	Sample string
	// Name is the file's name; its base name is recorded.
	Name string
	Data []byte
}

// Options tune Add and Reindex. The zero value takes the radiation from the
// file (else assumes Cu Kα1/Kα2), no internal standard, the indexing's
// default tolerance and neighbours within DefaultNeighbourDistance.
type Options struct {
	// Radiation as radiation.ParseRadiation reads it ("Cu", "Co:mono",
	// "1.5406/1.5444"); empty: what the file states.
	Radiation string
	// Standard is the internal standard mixed in: "Si" or "LaB6"; empty:
	// none. Reindex keeps the scan's standard when empty; "none" removes it.
	Standard string
	// ToleranceDeg is the indexing tolerance in 2θ (0: the default 0.10°).
	ToleranceDeg float64
	// NeighbourDistance is the composition distance for neighbours (0:
	// DefaultNeighbourDistance).
	NeighbourDistance float64
	// Notes are kept with the scan (Add only).
	Notes string
	// LibraryDirs are folders of CIF files whose phases the search-match
	// tries beside the built-in phase library and the folder the notebook's
	// phase-library setting names.
	LibraryDirs []string
}

// Result says what Add or Reindex did.
type Result struct {
	File   string
	Sample string
	// Record is the scan as stored, with every indexing and proposal; nil
	// for a duplicate.
	Record *meltbook.ScanRecord
	// Duplicate is set when the sample already held the same file (by
	// SHA-256): nothing was written.
	Duplicate *meltbook.ScanSummary
	// Weighed are the weighings of the new indexing's phases, in the
	// indexing's order, then of a diffuse halo if one was weighed.
	Weighed []Weighing
	// Notes say what was assumed and what could not be done.
	Notes []string
}

// Weighing is one candidate outcome with its weighing and, when it was
// proposed, the stored proposal.
type Weighing struct {
	Verdict verdict.Verdict
	// Proposal is nil for a candidate only noted (a halo where no metallic
	// glass scatters) and for a duplicate.
	Proposal *meltbook.ScanProposal
}

// attach fills each proposed weighing with its stored proposal: the
// proposals of the current indexing, in the order they were made.
func (r *Result) attach(proposed []bool) {
	x := r.Record.Current()
	var stored []meltbook.ScanProposal
	for _, p := range r.Record.Proposals {
		if p.IndexingVersion == x.Version {
			stored = append(stored, p)
		}
	}
	for i := range r.Weighed {
		if proposed[i] && len(stored) > 0 {
			p := stored[0]
			r.Weighed[i].Proposal = &p
			stored = stored[1:]
		}
	}
}

// Add reads one scan file, analyses it and stores it on its sample with its
// peaks, indexing and proposals, in one transaction; nothing is written
// when it fails. The same file on the same sample is not stored twice:
// Result.Duplicate names the scan that holds it. Errors are
// *meltbook.Error: Invalid for a file that does not read (naming file, line
// and column) or a bad option, NotFound for an unknown sample.
func Add(ctx context.Context, st *store.Store, who string, f File, opt Options) (*Result, error) {
	name := filepath.Base(f.Name)
	if strings.TrimSpace(f.Sample) == "" {
		return nil, meltbook.Errorf(meltbook.Invalid, name, "say which sample the scan was taken of")
	}
	res := &Result{File: name, Sample: f.Sample}
	sum := sha256.Sum256(f.Data)
	sha := hex.EncodeToString(sum[:])
	ev, err := st.SampleEvidence(ctx, f.Sample)
	if err != nil {
		return nil, err
	}
	dup, err := st.FindScanByFile(ctx, f.Sample, sha)
	switch {
	case err == nil:
		res.Duplicate = dup
		return res, nil
	case meltbook.KindOf(err) != meltbook.NotFound:
		return nil, err
	}
	sf, err := scanfile.Read(name, bytes.NewReader(f.Data))
	if err != nil {
		return nil, fileError(name, err)
	}
	sc := meltbook.Scan{
		SampleCode: f.Sample, FileName: name, SHA256: sha, Format: sf.Format.String(),
		TwoThetaDeg: sf.TwoThetaDeg, Counts: sf.Counts, CountErrors: sf.Errors, Notes: opt.Notes,
	}
	rad, assumed, err := chooseRadiation(opt.Radiation, name, &sf)
	if err != nil {
		return nil, err
	}
	sc.Radiation = scanRadiation(rad, assumed)
	if assumed {
		res.Notes = append(res.Notes, "the file states no radiation: Cu Kα1/Kα2 assumed (give the radiation, or correct it later with a re-indexing)")
	}
	std, err := standard(opt.Standard, "")
	if err != nil {
		return nil, err
	}
	if std != nil {
		sc.InternalStandard = std.Name
	}
	lib, err := knownPhases(ctx, st, ev, rad, opt)
	if err != nil {
		return nil, err
	}
	an, err := analyse(&sc, rad, std, opt.ToleranceDeg, lib)
	if err != nil {
		return nil, err
	}
	props, proposed, err := propose(ctx, st, ev, &sc, an, opt.NeighbourDistance, res)
	if err != nil {
		return nil, err
	}
	an.indexing.By = Program
	rec, err := st.AddScan(ctx, who, store.NewScan{Scan: sc, Indexing: an.indexing, Proposals: props})
	if err != nil {
		return nil, err
	}
	res.Record = rec
	res.attach(proposed)
	res.Notes = append(res.Notes, an.indexing.Notes...)
	return res, nil
}

// Reindex runs the peak search and indexing again on stored scan scanID and
// stores the result as the scan's next indexing version, with reason.
// opt.Radiation, when given, corrects the scan's recorded radiation;
// opt.Standard replaces its internal standard ("none" removes it). Earlier
// indexings stay; their proposals awaiting a decision are superseded.
func Reindex(ctx context.Context, st *store.Store, who string, scanID int64, reason string, opt Options) (*Result, error) {
	if strings.TrimSpace(reason) == "" {
		return nil, meltbook.Errorf(meltbook.Invalid, "reason", "say why the scan is indexed again")
	}
	old, err := st.ScanRecord(ctx, scanID)
	if err != nil {
		return nil, err
	}
	sc := old.Scan
	res := &Result{File: sc.FileName, Sample: sc.SampleCode}
	ev, err := st.SampleEvidence(ctx, sc.SampleCode)
	if err != nil {
		return nil, err
	}
	rad, err := storedRadiation(sc.Radiation)
	if err != nil {
		return nil, err
	}
	var corrected *meltbook.ScanRadiation
	if opt.Radiation != "" {
		if rad, err = radiation.ParseRadiation(opt.Radiation); err != nil {
			return nil, meltbook.Errorf(meltbook.Invalid, "radiation", "%v", err)
		}
		r := scanRadiation(rad, false)
		corrected = &r
		sc.Radiation = r
	} else if sc.Radiation.Assumed {
		res.Notes = append(res.Notes, "the radiation is still the assumed "+sc.Radiation.Text)
	}
	std, err := standard(opt.Standard, sc.InternalStandard)
	if err != nil {
		return nil, err
	}
	sc.InternalStandard = ""
	if std != nil {
		sc.InternalStandard = std.Name
	}
	lib, err := knownPhases(ctx, st, ev, rad, opt)
	if err != nil {
		return nil, err
	}
	an, err := analyse(&sc, rad, std, opt.ToleranceDeg, lib)
	if err != nil {
		return nil, err
	}
	props, proposed, err := propose(ctx, st, ev, &sc, an, opt.NeighbourDistance, res)
	if err != nil {
		return nil, err
	}
	an.indexing.By = Program
	an.indexing.Reason = reason
	rec, err := st.AddIndexing(ctx, who, scanID, store.NewIndexing{Indexing: an.indexing, Proposals: props, Radiation: corrected})
	if err != nil {
		return nil, err
	}
	res.Record = rec
	res.attach(proposed)
	res.Notes = append(res.Notes, an.indexing.Notes...)
	return res, nil
}

// fileError turns a scan reader's error into an Invalid error that keeps
// its file, line and column.
func fileError(name string, err error) error {
	var fe *scanfile.Error
	if errors.As(err, &fe) {
		return &meltbook.Error{Kind: meltbook.Invalid, Message: fe.Error()}
	}
	return meltbook.Errorf(meltbook.Invalid, name, "%v", err)
}

// chooseRadiation picks the radiation: the option, else the file's, else
// Cu Kα1/Kα2 assumed.
func chooseRadiation(text, name string, sf *scanfile.Scan) (radiation.Radiation, bool, error) {
	if text != "" {
		r, err := radiation.ParseRadiation(text)
		if err != nil {
			return r, false, meltbook.Errorf(meltbook.Invalid, "radiation", "%v", err)
		}
		return r, false, nil
	}
	if r, err := sf.Radiation(); err == nil {
		return r, false, nil
	} else if !errors.Is(err, scanfile.ErrNoRadiation) {
		return r, false, meltbook.Errorf(meltbook.Invalid, name, "%v", err)
	}
	r, err := radiation.FromAnode("Cu", radiation.Kalpha2Present)
	return r, true, err
}

// scanRadiation writes a radiation into the notebook's form.
func scanRadiation(r radiation.Radiation, assumed bool) meltbook.ScanRadiation {
	return meltbook.ScanRadiation{
		Anode: r.Anode, Kalpha1Angstrom: r.Kalpha1Angstrom, Kalpha2Angstrom: r.Kalpha2Angstrom,
		Kalpha2Ratio: r.Kalpha2Ratio, Kalpha2: r.Kalpha2.String(), Text: r.String(), Assumed: assumed,
	}
}

// storedRadiation reads the notebook's form back.
func storedRadiation(s meltbook.ScanRadiation) (radiation.Radiation, error) {
	r := radiation.Radiation{Anode: s.Anode, Kalpha1Angstrom: s.Kalpha1Angstrom, Kalpha2Angstrom: s.Kalpha2Angstrom, Kalpha2Ratio: s.Kalpha2Ratio}
	switch s.Kalpha2 {
	case meltbook.Kalpha2Doublet:
		r.Kalpha2 = radiation.Kalpha2Present
	case meltbook.Kalpha2Stripped:
		r.Kalpha2 = radiation.Kalpha2Stripped
	default:
		r.Kalpha2 = radiation.Kalpha2Absent
	}
	if err := r.Validate(); err != nil {
		return r, fmt.Errorf("stored radiation %q: %w", s.Text, err)
	}
	return r, nil
}

// standard resolves the internal-standard option against the one kept
// (a standard's full name, as stored).
func standard(option, kept string) (*peaks.Standard, error) {
	name := option
	if name == "" {
		name = kept
	}
	if name == "" || strings.EqualFold(name, "none") {
		return nil, nil
	}
	for _, s := range []peaks.Standard{peaks.SiliconSRM640f, peaks.LaB6SRM660c} {
		if s.Name == name {
			return &s, nil
		}
	}
	s, err := peaks.StandardByName(name)
	if err != nil {
		return nil, meltbook.Errorf(meltbook.Invalid, "standard", "%v", err)
	}
	return &s, nil
}
