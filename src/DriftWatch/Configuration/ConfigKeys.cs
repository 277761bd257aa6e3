namespace DriftWatch.Configuration;

/// <summary>Every key the file may hold, level by level. docs/configuration.md and docs/driftwatch.schema.json list the same.</summary>
internal static class ConfigKeys
{
    public static readonly KeyLevel Sample = new("sample", ["rows", "method", "all_rows_below", "bernoulli", "seed"]);

    public static readonly KeyLevel Thresholds = new("thresholds", ThresholdsSection.Keys);

    public static readonly KeyLevel BaselineWindow = new("baseline_window", ["from", "to"]);

    public static readonly KeyLevel Baseline = new("baseline", ("first_runs", null), ("window", BaselineWindow), ("rolling", null));

    public static readonly KeyLevel Source = new(
        "source", ["name", "kind", "connection", "password_file", "max_concurrent_queries", "statement_timeout"]);

    public static readonly KeyLevel Store = new(
        "store", ["kind", "connection", "password_file", "retention", "points_per_run", "points_retention"]);

    public static readonly KeyLevel Defaults = new(
        "defaults", ("schedule", null), ("sample", Sample), ("thresholds", Thresholds), ("baseline", Baseline));

    public static readonly KeyLevel Window = new("window", ["column", "last", "anchor"]);

    public static readonly KeyLevel Declared = new("declared", ["direction", "exact"]);

    public static readonly KeyLevel Pair = new(
        "pair",
        ("name", null),
        ("source", null),
        ("table", null),
        ("where", null),
        ("query", null),
        ("x", null),
        ("y", null),
        ("window", Window),
        ("sample", Sample),
        ("schedule", null),
        ("declared", Declared),
        ("thresholds", Thresholds),
        ("baseline", Baseline),
        ("notify", null),
        ("tags", null))
    {
        Renamed = new Dictionary<string, string>(StringComparer.Ordinal) { ["expect"] = "declared" },
    };

    public static readonly KeyLevel MailingList = new(
        "mailing_list", ["name", "channel", "recipients", "from_severity", "tags", "include_plot", "directory", "url", "secret", "secret_file", "format", "timeout"]);

    public static readonly KeyLevel Smtp = new("smtp", ["host", "port", "security", "ca_file", "user", "password", "password_file", "from"]);

    public static readonly KeyLevel Alerting = new(
        "alerting",
        ("mailing_lists", MailingList),
        ("smtp", Smtp),
        ("warning_confirm_runs", null),
        ("critical_confirm_runs", null),
        ("remind_every", null),
        ("fdr_q", null),
        ("check_failing_after", null),
        ("public_url", null));

    public static readonly KeyLevel Dashboard = new("dashboard", ["enabled", "bind", "port", "access_token", "user_header"]);

    public static readonly KeyLevel Logging = new("logging", ["format", "file", "level"]);

    public static readonly KeyLevel WorkerSpool = new("worker.spool", ["path", "max_runs", "max_bytes"]);

    public static readonly KeyLevel Worker = new("worker", ("stop_grace", null), ("id", null), ("alert_every", null), ("shared_schedule", null), ("heartbeat", null), ("takeover_after", null), ("spool", WorkerSpool));

    public static readonly KeyLevel Root = new(
        "root",
        ("sources", Source),
        ("store", Store),
        ("defaults", Defaults),
        ("pairs", Pair),
        ("alerting", Alerting),
        ("dashboard", Dashboard),
        ("logging", Logging),
        ("worker", Worker));
}
