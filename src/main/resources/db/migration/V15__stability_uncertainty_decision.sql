-- A qualification decision that adds u_hom and u_stab to u(x_pt) (QualificationService.Decision). The column is
-- widened for its name and the CHECK constraint replaced; neither touches an existing row's value.

ALTER TABLE qualification_decision DROP CONSTRAINT qualification_decision_decision_check;
ALTER TABLE qualification_decision ALTER COLUMN decision TYPE varchar(64);
ALTER TABLE qualification_decision ADD CONSTRAINT qualification_decision_decision_check
    CHECK (decision IN ('ACCEPT', 'WIDEN_SIGMA_PT', 'ADD_HOMOGENEITY_UNCERTAINTY',
                        'ADD_HOMOGENEITY_AND_STABILITY_UNCERTAINTY', 'WITHDRAW_MEASURAND'));
