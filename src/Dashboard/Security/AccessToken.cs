using System.Security.Cryptography;
using System.Text;

namespace LatticeSweep.Dashboard.Security;

/// <summary>
/// The access token as the server keeps it: only its SHA-256 digest, compared in constant time.
/// The browser's cookie holds the digest too, so the token itself is never stored by the browser.
/// </summary>
internal sealed class AccessToken
{
    private readonly byte[] _digest;

    public AccessToken(string token)
    {
        ArgumentException.ThrowIfNullOrEmpty(token);
        _digest = Digest(token);
        CookieValue = Convert.ToHexString(_digest);
    }

    /// <summary>The value the access cookie carries.</summary>
    public string CookieValue { get; }

    public bool Matches(string? candidate) =>
        !string.IsNullOrEmpty(candidate) && CryptographicOperations.FixedTimeEquals(Digest(candidate), _digest);

    public bool MatchesCookie(string? cookie) =>
        !string.IsNullOrEmpty(cookie) && cookie.Length == CookieValue.Length
        && CryptographicOperations.FixedTimeEquals(Encoding.ASCII.GetBytes(cookie), Encoding.ASCII.GetBytes(CookieValue));

    private static byte[] Digest(string text) => SHA256.HashData(Encoding.UTF8.GetBytes(text));
}
