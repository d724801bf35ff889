-- Phase calls of every crystal system and named phases of known structure.
--
-- An indexed phase may now be of any crystal system (tetragonal,
-- hexagonal, orthorhombic, monoclinic, triclinic, rhombohedral beside
-- icosahedral, approximant and cubic) with any centring (P, I, F, A, B, C,
-- R); it may name a phase of known structure (its name, space group and
-- published structure), carry the cell constants its kind leaves free and
-- the Rwp of a whole-pattern check. An assignment keeps the line's
-- predicted intensity, a model tried the library phase it stood for.
--
-- Portable SQL as in 001 and 002. A CHECK constraint cannot be altered in
-- SQLite, so indexed_phase is rebuilt by SQLite's procedure for other
-- table changes (https://www.sqlite.org/lang_altertable.html#otheralter):
-- create the new table under another name, copy the rows with their ids,
-- drop the old table, rename the new one, recreate its index. The store
-- runs every migration with foreign-key enforcement off and checks the
-- whole file with PRAGMA foreign_key_check before it commits (steps 1, 10
-- and 12 of that procedure), so peak_assignment.phase_id and
-- indexing_proposal.phase_id, which name indexed_phase by name, hold the
-- same ids afterwards. The old table is never renamed: SQLite would then
-- rewrite those references to follow it. The PostgreSQL twin of this file
-- changes the constraints in place (ALTER TABLE ... DROP CONSTRAINT, ADD
-- CONSTRAINT, ADD COLUMN) instead of rebuilding.
--
-- Cell constants and angles the kind fixes are NULL, and so are their
-- standard uncertainties; whole_pattern_rwp and predicted_intensity are
-- NULL when none was computed (a computed 0 is kept as 0).

CREATE TABLE indexed_phase_rebuilt (
    id                        INTEGER PRIMARY KEY,
    indexing_id               INTEGER NOT NULL REFERENCES indexing (id),
    position                  INTEGER NOT NULL,
    kind                      TEXT NOT NULL CHECK (kind IN ('icosahedral', 'approximant', 'cubic', 'tetragonal',
                                  'hexagonal', 'orthorhombic', 'monoclinic', 'triclinic', 'rhombohedral')),
    lattice                   TEXT NOT NULL CHECK (lattice IN ('P', 'I', 'F', 'A', 'B', 'C', 'R')),
    approximant_order         TEXT NOT NULL DEFAULT '',
    approximant_of            TEXT NOT NULL DEFAULT '',
    ideal_a_angstrom          DOUBLE PRECISION,
    phase                     TEXT NOT NULL DEFAULT '',
    space_group               TEXT NOT NULL DEFAULT '',
    structure_reference       TEXT NOT NULL DEFAULT '',
    constant_angstrom         DOUBLE PRECISION NOT NULL,
    constant_su_angstrom      DOUBLE PRECISION NOT NULL,
    b_angstrom                DOUBLE PRECISION CHECK (b_angstrom > 0),
    b_su_angstrom             DOUBLE PRECISION CHECK (b_su_angstrom >= 0),
    c_angstrom                DOUBLE PRECISION CHECK (c_angstrom > 0),
    c_su_angstrom             DOUBLE PRECISION CHECK (c_su_angstrom >= 0),
    alpha_deg                 DOUBLE PRECISION CHECK (alpha_deg > 0 AND alpha_deg < 180),
    alpha_su_deg              DOUBLE PRECISION CHECK (alpha_su_deg >= 0),
    beta_deg                  DOUBLE PRECISION CHECK (beta_deg > 0 AND beta_deg < 180),
    beta_su_deg               DOUBLE PRECISION CHECK (beta_su_deg >= 0),
    gamma_deg                 DOUBLE PRECISION CHECK (gamma_deg > 0 AND gamma_deg < 180),
    gamma_su_deg              DOUBLE PRECISION CHECK (gamma_su_deg >= 0),
    a6_angstrom               DOUBLE PRECISION,
    zero_shift_deg            DOUBLE PRECISION NOT NULL,
    zero_shift_su_deg         DOUBLE PRECISION NOT NULL,
    figure_of_merit           DOUBLE PRECISION NOT NULL,
    chance                    DOUBLE PRECISION NOT NULL CHECK (chance >= 0 AND chance <= 1),
    chance_basis              TEXT NOT NULL,
    explained_intensity       DOUBLE PRECISION NOT NULL,
    rms_residual_deg          DOUBLE PRECISION NOT NULL,
    phason_strain             INTEGER NOT NULL DEFAULT 0 CHECK (phason_strain IN (0, 1)),
    whole_pattern_rwp         DOUBLE PRECISION CHECK (whole_pattern_rwp >= 0),
    UNIQUE (indexing_id, position),
    CHECK (b_su_angstrom IS NULL OR b_angstrom IS NOT NULL),
    CHECK (c_su_angstrom IS NULL OR c_angstrom IS NOT NULL),
    CHECK (alpha_su_deg IS NULL OR alpha_deg IS NOT NULL),
    CHECK (beta_su_deg IS NULL OR beta_deg IS NOT NULL),
    CHECK (gamma_su_deg IS NULL OR gamma_deg IS NOT NULL)
);

INSERT INTO indexed_phase_rebuilt (id, indexing_id, position, kind, lattice, approximant_order, approximant_of,
        ideal_a_angstrom, constant_angstrom, constant_su_angstrom, a6_angstrom, zero_shift_deg, zero_shift_su_deg,
        figure_of_merit, chance, chance_basis, explained_intensity, rms_residual_deg, phason_strain)
    SELECT id, indexing_id, position, kind, lattice, approximant_order, approximant_of,
        ideal_a_angstrom, constant_angstrom, constant_su_angstrom, a6_angstrom, zero_shift_deg, zero_shift_su_deg,
        figure_of_merit, chance, chance_basis, explained_intensity, rms_residual_deg, phason_strain
    FROM indexed_phase;

DROP TABLE indexed_phase;

ALTER TABLE indexed_phase_rebuilt RENAME TO indexed_phase;

CREATE INDEX indexed_phase_by_indexing ON indexed_phase (indexing_id);

-- The line's computed intensity, the phase's strongest predicted line = 100.
ALTER TABLE peak_assignment ADD COLUMN predicted_intensity DOUBLE PRECISION CHECK (predicted_intensity >= 0);

-- The library phase a model tried stood for, '' for a lattice model.
ALTER TABLE indexing_model ADD COLUMN phase TEXT NOT NULL DEFAULT '';
