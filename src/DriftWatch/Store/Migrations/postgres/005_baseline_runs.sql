-- Baselines keep their pooled runs' own figures (what a check is compared with: their centre and the spread
-- between them), and each run records the baseline it was judged against (JSON, snake_case).
ALTER TABLE baselines ADD COLUMN runs_json TEXT;
ALTER TABLE runs ADD COLUMN baseline_json TEXT;
