namespace DriftWatch.Tests.Configuration;

/// <summary>A configuration that uses every key the loader accepts (a test checks that), with values unlike the defaults.</summary>
internal static class FullConfig
{
    public const string PasswordFileName = "pg-password.txt";

    public const string CaFileName = "grocer-ca.pem";

    public static readonly Dictionary<string, string> Env = new(StringComparer.Ordinal)
    {
        ["PG_HOST"] = "db.internal",
        ["SMTP_PASSWORD"] = "smtp-Secret-Value-7",
        ["DASH_TOKEN"] = "dashboard-token-0123456789",
        ["HOOK_TOKEN"] = "hook-token-T0K",
        ["HOOK_SECRET"] = "hook-Secret-Value-0123",
    };

    public const string Yaml = """
        sources:
          - name: shop
            kind: postgres
            connection: Host=${PG_HOST};Port=${PG_PORT:-5433};Database=grocer;Username=reader
            password_file: pg-password.txt
            max_concurrent_queries: 4
            statement_timeout: 1m30s
          - name: warehouse
            kind: sqlite
            connection: data/warehouse.db
        store:
          kind: sqlite
          connection: Data Source=history/dw.db
          password_file:
          retention: 90d
          points_per_run: 500
          points_retention: 40d
        defaults:
          schedule: "0 */10 * * * ?"
          sample:
            rows: 2000
            method: random
            all_rows_below: 1000
            bernoulli: true
            seed: 7
          thresholds:
            alpha: 0.05
            outlier_t: 4
          baseline:
            first_runs: 8
        pairs:
          - name: basket-items-vs-value
            source: shop
            table: shop.orders
            where: status = 'completed'
            x: basket_items
            y: basket_value
            window:
              column: placed_at
              last: 1d12h
              anchor: latest
            sample:
              rows: 300
              method: tablesample
            schedule: "15 * * * *"
            declared:
              direction: positive
              exact: false
            thresholds:
              min_correlation_change: 0.25
            baseline:
              window:
                from: 2026-01-01
                to: 2026-01-31
            notify: [team, archive]
            tags: [orders, finance]
          - name: net-vs-gross
            source: shop
            query: SELECT net_total, gross_total FROM shop.invoices;
            x: net_total
            y: gross_total
            declared:
              direction: negative
              exact: true
            baseline:
              rolling: 30d
            notify: team
          - name: pick-lines-vs-seconds
            source: warehouse
            table: pick_lists
            x: pick_lines
            y: pick_seconds
        alerting:
          mailing_lists:
            - name: team
              channel: smtp
              recipients: [data@grocer.example, "Ops <ops@grocer.example>"]
              from_severity: info
              tags: [finance]
              include_plot: false
            - name: archive
              channel: file
              recipients: []
              directory: alerts
              from_severity: critical
            - name: chat
              channel: webhook
              url: https://hooks.grocer.example/in/${HOOK_TOKEN}
              secret: ${HOOK_SECRET}
              secret_file:
              format: text
              timeout: 20s
          smtp:
            host: mail.grocer.example
            port: 465
            security: tls
            ca_file: grocer-ca.pem
            user: driftwatch
            password: ${SMTP_PASSWORD}
            password_file:
            from: DriftWatch <dw@grocer.example>
          warning_confirm_runs: 3
          critical_confirm_runs: 2
          remind_every: 12h
          fdr_q: off
          check_failing_after: 5
          public_url: https://dw.grocer.example/
        dashboard:
          enabled: true
          bind: 0.0.0.0
          port: 9000
          access_token: ${DASH_TOKEN}
          user_header: X-Forwarded-User
        logging:
          format: json
          file: logs/dw.log
          level: debug
        worker:
          stop_grace: 45s
          id: monitor-1
          alert_every: 10s
          shared_schedule: false
          heartbeat: 2s
          takeover_after: 10s
          spool:
            path: /var/lib/driftwatch/spool
            max_runs: 5000
            max_bytes: 104857600
        """;
}
