namespace LatticeSweep.Worker.JobFiles;

/// <summary>"Did you mean" hints: the nearest known name by edit distance.</summary>
internal static class KeySuggestions
{
    /// <summary>The closest candidate, when it is close enough to be a plausible typo.</summary>
    public static string? Nearest(string given, IEnumerable<string> candidates)
    {
        string? best = null;
        var bestDistance = int.MaxValue;
        foreach (var c in candidates)
        {
            var d = Distance(given.ToLowerInvariant(), c.ToLowerInvariant());
            if (d < bestDistance || (d == bestDistance && best is not null && string.CompareOrdinal(c, best) < 0))
            {
                best = c;
                bestDistance = d;
            }
        }

        // A hint that shares little with what was typed misleads more than it helps.
        var allowed = Math.Max(2, given.Length / 3);
        return best is not null && bestDistance <= allowed ? best : null;
    }

    /// <summary>" (did you mean 'x'?)" or, failing that, the list of known names.</summary>
    public static string Hint(string given, IReadOnlyCollection<string> candidates)
    {
        var nearest = Nearest(given, candidates);
        if (nearest is not null)
        {
            return $"did you mean '{EchoText.Of(nearest)}'?";
        }

        return candidates.Count == 0 ? "nothing is allowed here" : "known: " + string.Join(", ", candidates.Order(StringComparer.Ordinal).Select(EchoText.Of));
    }

    /// <summary>Levenshtein distance (insert, delete, substitute).</summary>
    public static int Distance(string a, string b)
    {
        var previous = new int[b.Length + 1];
        var current = new int[b.Length + 1];
        for (var j = 0; j <= b.Length; j++)
        {
            previous[j] = j;
        }

        for (var i = 1; i <= a.Length; i++)
        {
            current[0] = i;
            for (var j = 1; j <= b.Length; j++)
            {
                var cost = a[i - 1] == b[j - 1] ? 0 : 1;
                current[j] = Math.Min(Math.Min(current[j - 1] + 1, previous[j] + 1), previous[j - 1] + cost);
            }

            (previous, current) = (current, previous);
        }

        return previous[b.Length];
    }
}
