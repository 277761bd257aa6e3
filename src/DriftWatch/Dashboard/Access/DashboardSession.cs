namespace DriftWatch.Dashboard.Access;

/// <summary>
/// One signed-in browser: when the session ends, the name its holder gave (null when none was asked for) and the
/// session's CSRF token, which every action form carries in a hidden field and every POST must repeat.
/// </summary>
internal sealed record DashboardSession(DateTimeOffset Expires, string? Name, string CsrfToken);
