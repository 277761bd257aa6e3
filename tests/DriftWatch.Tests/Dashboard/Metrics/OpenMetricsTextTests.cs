using DriftWatch.Dashboard.Metrics;

namespace DriftWatch.Tests.Dashboard.Metrics;

public sealed class OpenMetricsTextTests
{
    // The spec's "Considerations: Canonical Numbers" lists how exposers SHOULD render these values
    // (OpenMetrics 1.0, prometheus/docs docs/specs/om/open_metrics_spec.md); 1e+23 and 1.1e+23 are from its
    // histogram example.
    [Theory]
    [InlineData(0.0, "0.0")]
    [InlineData(0.001, "0.001")]
    [InlineData(0.002, "0.002")]
    [InlineData(0.01, "0.01")]
    [InlineData(0.1, "0.1")]
    [InlineData(0.9, "0.9")]
    [InlineData(0.95, "0.95")]
    [InlineData(0.99, "0.99")]
    [InlineData(0.999, "0.999")]
    [InlineData(1.0, "1.0")]
    [InlineData(1.7, "1.7")]
    [InlineData(10.0, "10.0")]
    [InlineData(1e-10, "1e-10")]
    [InlineData(1e-09, "1e-09")]
    [InlineData(1e-05, "1e-05")]
    [InlineData(0.0001, "0.0001")]
    [InlineData(100000.0, "100000.0")]
    [InlineData(1e+06, "1e+06")]
    [InlineData(1e+10, "1e+10")]
    [InlineData(1e+23, "1e+23")]
    [InlineData(1.1e+23, "1.1e+23")]
    [InlineData(double.PositiveInfinity, "+Inf")]
    public void Bound_SpecExamples_RenderCanonically(double value, string expected) =>
        Assert.Equal(expected, OpenMetricsText.Bound(value));

    [Fact]
    public void Sample_LabelValueWithQuoteBackslashAndNewline_IsEscapedAsTheSpecSays()
    {
        var text = new OpenMetricsText();
        text.Family("x", "gauge", "h");
        text.Sample("x", [("a", "q\"b\\n\nz")], "1");

        // "Escaping": line feed -> \n, double quote -> \", backslash -> \\.
        Assert.Contains("x{a=\"q\\\"b\\\\n\\nz\"} 1\n", text.Finish(), StringComparison.Ordinal);
    }

    [Fact]
    public void Checker_AcceptsTheSpecsOwnExamples()
    {
        // The complete exposition of "Overall Structure" and the histogram example of "Histogram", verbatim in content.
        const string overall =
            "# TYPE acme_http_router_request_seconds summary\n" +
            "# UNIT acme_http_router_request_seconds seconds\n" +
            "# HELP acme_http_router_request_seconds Latency though all of ACME's HTTP request router.\n" +
            "acme_http_router_request_seconds_sum{path=\"/api/v1\",method=\"GET\"} 9036.32\n" +
            "acme_http_router_request_seconds_count{path=\"/api/v1\",method=\"GET\"} 807283.0\n" +
            "acme_http_router_request_seconds_created{path=\"/api/v1\",method=\"GET\"} 1605281325.0\n" +
            "acme_http_router_request_seconds_sum{path=\"/api/v2\",method=\"POST\"} 479.3\n" +
            "acme_http_router_request_seconds_count{path=\"/api/v2\",method=\"POST\"} 34.0\n" +
            "acme_http_router_request_seconds_created{path=\"/api/v2\",method=\"POST\"} 1605281325.0\n" +
            "# TYPE go_goroutines gauge\n" +
            "# HELP go_goroutines Number of goroutines that currently exist.\n" +
            "go_goroutines 69\n" +
            "# TYPE process_cpu_seconds counter\n" +
            "# UNIT process_cpu_seconds seconds\n" +
            "# HELP process_cpu_seconds Total user and system CPU time spent in seconds.\n" +
            "process_cpu_seconds_total 4.20072246e+06\n" +
            "# EOF\n";
        const string histogram =
            "# TYPE foo histogram\n" +
            "foo_bucket{le=\"0.0\"} 0\nfoo_bucket{le=\"1e-05\"} 0\nfoo_bucket{le=\"0.0001\"} 5\nfoo_bucket{le=\"0.1\"} 8\n" +
            "foo_bucket{le=\"1.0\"} 10\nfoo_bucket{le=\"10.0\"} 11\nfoo_bucket{le=\"100000.0\"} 11\nfoo_bucket{le=\"1e+06\"} 15\n" +
            "foo_bucket{le=\"1e+23\"} 16\nfoo_bucket{le=\"1.1e+23\"} 17\nfoo_bucket{le=\"+Inf\"} 17\n" +
            "foo_count 17\nfoo_sum 324789.3\nfoo_created 1520430000.123\n# EOF\n";

        Assert.Equal(3, OpenMetricsChecker.Parse(overall).Count);
        Assert.Equal(17, OpenMetricsChecker.Parse(histogram)["foo"].Samples.Single(s => s.Name == "foo_count").Number);
    }

    [Theory]
    // The spec's "incorrect example where Metrics are interleaved" (MetricPoint section).
    [InlineData("# TYPE foo_seconds summary\nfoo_seconds_count{a=\"bb\"} 0\nfoo_seconds_count{a=\"ccc\"} 0\nfoo_seconds_count{a=\"bb\"} 1\n# EOF\n")]
    // A histogram whose buckets are not cumulative, one without +Inf, a count that is not the +Inf bucket.
    [InlineData("# TYPE h histogram\nh_bucket{le=\"1.0\"} 5\nh_bucket{le=\"+Inf\"} 3\nh_count 3\nh_sum 1.0\n# EOF\n")]
    [InlineData("# TYPE h histogram\nh_bucket{le=\"1.0\"} 5\nh_count 5\nh_sum 1.0\n# EOF\n")]
    [InlineData("# TYPE h histogram\nh_bucket{le=\"1.0\"} 1\nh_bucket{le=\"+Inf\"} 3\nh_count 4\nh_sum 1.0\n# EOF\n")]
    // A counter sample without _total, a missing EOF, a CR line end.
    [InlineData("# TYPE c counter\nc 3\n# EOF\n")]
    [InlineData("# TYPE g gauge\ng 3\n")]
    [InlineData("# TYPE g gauge\r\ng 3\r\n# EOF\n")]
    public void Checker_RejectsExpositionsTheSpecForbids(string text) =>
        Assert.ThrowsAny<Exception>(() => OpenMetricsChecker.Parse(text));
}
