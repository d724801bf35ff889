-- Diffraction scans, their peaks and indexings, and the automatic outcome
-- proposals made from them.
--
-- Portable SQL as in 001, with one more exception: a scan's points are
-- BLOBs of little-endian IEEE 754 doubles (BYTEA in PostgreSQL), since a
-- scan of a few thousand points is always read and written whole.

-- One powder scan of a sample, as imported. The same file (by SHA-256) is
-- held once per sample. Radiation is what the file or the person stated,
-- or, with radiation_assumed = 1, the default taken when neither did; a
-- correction is an amendment recorded in the history.
CREATE TABLE scan (
    id                 INTEGER PRIMARY KEY,
    sample_id          INTEGER NOT NULL REFERENCES sample (id),
    file_name          TEXT NOT NULL,
    sha256             TEXT NOT NULL,
    file_format        TEXT NOT NULL,
    anode              TEXT NOT NULL DEFAULT '',
    kalpha1_angstrom   DOUBLE PRECISION NOT NULL CHECK (kalpha1_angstrom > 0),
    kalpha2_angstrom   DOUBLE PRECISION NOT NULL DEFAULT 0,
    kalpha2_ratio      DOUBLE PRECISION NOT NULL DEFAULT 0,
    kalpha2_state      TEXT NOT NULL CHECK (kalpha2_state IN ('doublet', 'stripped', 'mono')),
    radiation_text     TEXT NOT NULL,
    radiation_assumed  INTEGER NOT NULL DEFAULT 0 CHECK (radiation_assumed IN (0, 1)),
    internal_standard  TEXT NOT NULL DEFAULT '',
    points             INTEGER NOT NULL CHECK (points >= 2),
    two_theta_from_deg DOUBLE PRECISION NOT NULL,
    two_theta_to_deg   DOUBLE PRECISION NOT NULL,
    two_theta_deg      BLOB NOT NULL,
    counts             BLOB NOT NULL,
    count_errors       BLOB,
    imported_at        TEXT NOT NULL,
    imported_by        TEXT NOT NULL,
    notes              TEXT NOT NULL DEFAULT '',
    UNIQUE (sample_id, sha256)
);

-- One run of the peak search and indexing on a scan, numbered per scan from
-- 1; the highest version is the current one. Earlier versions are kept.
-- radiation_* and internal_standard are those the run used.
CREATE TABLE indexing (
    id                     INTEGER PRIMARY KEY,
    scan_id                INTEGER NOT NULL REFERENCES scan (id),
    version                INTEGER NOT NULL CHECK (version >= 1),
    indexed_at             TEXT NOT NULL,
    indexed_by             TEXT NOT NULL,
    requested_by           TEXT NOT NULL,
    reason                 TEXT NOT NULL DEFAULT '',
    anode                  TEXT NOT NULL DEFAULT '',
    kalpha1_angstrom       DOUBLE PRECISION NOT NULL CHECK (kalpha1_angstrom > 0),
    kalpha2_angstrom       DOUBLE PRECISION NOT NULL DEFAULT 0,
    kalpha2_ratio          DOUBLE PRECISION NOT NULL DEFAULT 0,
    kalpha2_state          TEXT NOT NULL CHECK (kalpha2_state IN ('doublet', 'stripped', 'mono')),
    radiation_text         TEXT NOT NULL,
    radiation_assumed      INTEGER NOT NULL DEFAULT 0 CHECK (radiation_assumed IN (0, 1)),
    internal_standard      TEXT NOT NULL DEFAULT '',
    zero_shift_deg         DOUBLE PRECISION,
    zero_shift_su_deg      DOUBLE PRECISION,
    tolerance_deg          DOUBLE PRECISION NOT NULL,
    max_chance             DOUBLE PRECISION NOT NULL,
    notes                  TEXT NOT NULL DEFAULT '',
    UNIQUE (scan_id, version)
);

-- A fitted peak of one indexing's peak search. Standard uncertainties are
-- NULL where the fit could not give one; corrected_* are set when an
-- internal standard gave a zero shift.
CREATE TABLE peak (
    id                      INTEGER PRIMARY KEY,
    indexing_id             INTEGER NOT NULL REFERENCES indexing (id),
    position                INTEGER NOT NULL,
    two_theta_deg           DOUBLE PRECISION NOT NULL,
    two_theta_su_deg        DOUBLE PRECISION,
    d_angstrom              DOUBLE PRECISION NOT NULL,
    d_su_angstrom           DOUBLE PRECISION,
    height                  DOUBLE PRECISION NOT NULL,
    height_su               DOUBLE PRECISION,
    area                    DOUBLE PRECISION NOT NULL,
    area_su                 DOUBLE PRECISION,
    fwhm_deg                DOUBLE PRECISION NOT NULL,
    fwhm_su_deg             DOUBLE PRECISION,
    eta                     DOUBLE PRECISION NOT NULL,
    eta_su                  DOUBLE PRECISION,
    significance            DOUBLE PRECISION NOT NULL,
    standard_line           TEXT NOT NULL DEFAULT '',
    corrected_two_theta_deg DOUBLE PRECISION,
    corrected_d_angstrom    DOUBLE PRECISION,
    found                   TEXT NOT NULL CHECK (found IN ('automatic', 'by hand')),
    UNIQUE (indexing_id, position)
);

-- A phase an indexing found, in the order the indexing reports them.
CREATE TABLE indexed_phase (
    id                        INTEGER PRIMARY KEY,
    indexing_id               INTEGER NOT NULL REFERENCES indexing (id),
    position                  INTEGER NOT NULL,
    kind                      TEXT NOT NULL CHECK (kind IN ('icosahedral', 'approximant', 'cubic')),
    lattice                   TEXT NOT NULL CHECK (lattice IN ('P', 'I', 'F')),
    approximant_order         TEXT NOT NULL DEFAULT '',
    approximant_of            TEXT NOT NULL DEFAULT '',
    ideal_a_angstrom          DOUBLE PRECISION,
    constant_angstrom         DOUBLE PRECISION NOT NULL,
    constant_su_angstrom      DOUBLE PRECISION NOT NULL,
    a6_angstrom               DOUBLE PRECISION,
    zero_shift_deg            DOUBLE PRECISION NOT NULL,
    zero_shift_su_deg         DOUBLE PRECISION NOT NULL,
    figure_of_merit           DOUBLE PRECISION NOT NULL,
    chance                    DOUBLE PRECISION NOT NULL CHECK (chance >= 0 AND chance <= 1),
    chance_basis              TEXT NOT NULL,
    explained_intensity       DOUBLE PRECISION NOT NULL,
    rms_residual_deg          DOUBLE PRECISION NOT NULL,
    phason_strain             INTEGER NOT NULL DEFAULT 0 CHECK (phason_strain IN (0, 1)),
    UNIQUE (indexing_id, position)
);

-- Which reflection explains which peak.
CREATE TABLE peak_assignment (
    phase_id                 INTEGER NOT NULL REFERENCES indexed_phase (id),
    peak_id                  INTEGER NOT NULL REFERENCES peak (id),
    calculated_two_theta_deg DOUBLE PRECISION NOT NULL,
    residual_deg             DOUBLE PRECISION NOT NULL,
    d_angstrom               DOUBLE PRECISION NOT NULL,
    label                    TEXT NOT NULL,
    detail                   TEXT NOT NULL DEFAULT '',
    PRIMARY KEY (phase_id, peak_id)
);

-- The best solution of every model tried on all the peaks, significant or
-- not, so that "no phase beats chance" can show how close each came.
CREATE TABLE indexing_model (
    indexing_id       INTEGER NOT NULL REFERENCES indexing (id),
    position          INTEGER NOT NULL,
    kind              TEXT NOT NULL,
    lattice           TEXT NOT NULL,
    approximant_order TEXT NOT NULL DEFAULT '',
    scale_angstrom    DOUBLE PRECISION NOT NULL,
    indexed_peaks     INTEGER NOT NULL,
    figure_of_merit   DOUBLE PRECISION NOT NULL,
    chance            DOUBLE PRECISION NOT NULL,
    PRIMARY KEY (indexing_id, position)
);

-- Unexplained specimen peaks of an indexing.
CREATE TABLE unexplained_peak (
    indexing_id INTEGER NOT NULL REFERENCES indexing (id),
    peak_id     INTEGER NOT NULL REFERENCES peak (id),
    PRIMARY KEY (indexing_id, peak_id)
);

-- An automatic outcome proposed from an indexing: the outcome row (source
-- 'automatic') with the weighing's confidence, and the indexed phase it
-- rests on (NULL for a proposal from the pattern as a whole, such as an
-- amorphous halo).
CREATE TABLE indexing_proposal (
    outcome_id  INTEGER PRIMARY KEY REFERENCES outcome (id),
    indexing_id INTEGER NOT NULL REFERENCES indexing (id),
    phase_id    INTEGER REFERENCES indexed_phase (id),
    confidence  TEXT NOT NULL CHECK (confidence IN ('high', 'medium', 'low'))
);

CREATE INDEX scan_by_sample ON scan (sample_id);
CREATE INDEX indexing_by_scan ON indexing (scan_id, version);
CREATE INDEX peak_by_indexing ON peak (indexing_id);
CREATE INDEX indexed_phase_by_indexing ON indexed_phase (indexing_id);
CREATE INDEX indexing_proposal_by_indexing ON indexing_proposal (indexing_id);
