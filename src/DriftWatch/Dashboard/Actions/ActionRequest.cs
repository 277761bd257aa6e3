using System.Security.Cryptography;
using System.Text;
using DriftWatch.Dashboard.Access;
using DriftWatch.Triage;
using Microsoft.AspNetCore.Http;

namespace DriftWatch.Dashboard.Actions;

/// <summary>
/// The checks every action POST passes before it changes anything: the browser's Origin (when sent) is this
/// dashboard; the request belongs to a live session; the form repeats that session's CSRF token (compared in
/// constant time); and someone is named. SameSite=Strict on the cookie already keeps other sites' forms out in
/// current browsers; the token does not depend on the browser getting that right.
/// </summary>
internal sealed record ActionRequest(IFormCollection Form, Actor Actor)
{
    public const string CsrfField = "csrf";

    /// <summary>The checked request, or the refusal to send (403, or 400 when only the name is missing).</summary>
    public static async Task<(ActionRequest? Request, IResult? Refusal)> ReadAsync(HttpContext http, DashboardAccess access)
    {
        ArgumentNullException.ThrowIfNull(http);
        ArgumentNullException.ThrowIfNull(access);
        var request = http.Request;
        // The pages send Referrer-Policy: no-referrer, under which browsers send "Origin: null" with their own forms;
        // "null" proves nothing either way, so only a named foreign origin is refused here (the token decides the rest).
        if (request.Headers.Origin.ToString() is { Length: > 0 } origin && origin != "null" && !SameOrigin(origin, request))
        {
            return (null, Refuse("This form was sent from another site (Origin " + origin + "); nothing was changed."));
        }

        var session = access.SessionOf(request);
        if (session is null)
        {
            return (null, Refuse("Actions need a sign-in: open /login, give your name" + (access.TokenRequired ? " and the access token" : string.Empty) + ", then try again. Nothing was changed."));
        }

        var form = request.HasFormContentType ? await request.ReadFormAsync(http.RequestAborted) : FormCollection.Empty;
        if (!SameToken(form[CsrfField].ToString(), session.CsrfToken))
        {
            return (null, Refuse("The form's security token is missing or out of date (was the page open before a sign-in?). Reload the page and try again; nothing was changed."));
        }

        var name = access.ActorName(request, session) ?? Actor.Clean(form["actor"].ToString());
        if (name is null)
        {
            return (null, Results.Text("Give your name: the audit log records who acted. Nothing was changed.\n", "text/plain; charset=utf-8", statusCode: StatusCodes.Status400BadRequest));
        }

        return (new ActionRequest(form, Actor.Dashboard(name)), null);
    }

    public string? Reason => Actor.Clean(Form["reason"].ToString());

    private static IResult Refuse(string message) =>
        Results.Text(message + "\n", "text/plain; charset=utf-8", statusCode: StatusCodes.Status403Forbidden);

    private static bool SameToken(string sent, string expected) =>
        CryptographicOperations.FixedTimeEquals(SHA256.HashData(Encoding.UTF8.GetBytes(sent)), SHA256.HashData(Encoding.UTF8.GetBytes(expected)));

    private static bool SameOrigin(string origin, HttpRequest request) =>
        Uri.TryCreate(origin, UriKind.Absolute, out var uri)
        && string.Equals(uri.Scheme, request.Scheme, StringComparison.OrdinalIgnoreCase)
        && string.Equals(uri.Authority, request.Host.Value, StringComparison.OrdinalIgnoreCase);
}
