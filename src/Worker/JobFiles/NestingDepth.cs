namespace LatticeSweep.Worker.JobFiles;

/// <summary>
/// Finds where a TOML text nests deeper than we read: tables in headers, dotted keys, arrays and
/// inline tables inside each other. The TOML library stops at 64 levels with an exception that
/// names no line and gives advice about its own settings; this scan runs first, with a lower
/// limit, so the user gets the line and column instead. A job file needs about six levels.
/// It is a scan, not a parser: strings and comments are skipped, everything else is counted.
/// </summary>
internal static class NestingDepth
{
    /// <summary>Deepest nesting accepted (the TOML library's own limit is 64).</summary>
    public const int Max = 32;

    /// <summary>The first place where nesting goes beyond <paramref name="max"/>, or null.</summary>
    public static SourceLocation? FindTooDeep(string text, int max = Max)
    {
        ArgumentNullException.ThrowIfNull(text);
        var scan = new Scan(text, max);
        return scan.Run();
    }

    private sealed class Scan(string text, int max)
    {
        // One level per open array or inline table; keyDots[0] is the top-level key's dots.
        private readonly List<char> _open = [];
        private readonly List<int> _keyDots = [0];
        private int _pos;
        private int _line = 1;
        private int _column = 1;
        private int _headerDepth;
        private bool _inKey = true;
        private bool _lineStart = true;

        public SourceLocation? Run()
        {
            while (_pos < text.Length)
            {
                var c = text[_pos];
                if (c == '\n')
                {
                    Advance();
                    if (_open.Count == 0)
                    {
                        _inKey = true;
                        _lineStart = true;
                        _keyDots[0] = 0;
                    }

                    continue;
                }

                if (c is ' ' or '\t' or '\r')
                {
                    Advance();
                    continue;
                }

                if (c == '#')
                {
                    while (_pos < text.Length && text[_pos] != '\n')
                    {
                        Advance();
                    }

                    continue;
                }

                if (c is '"' or '\'')
                {
                    SkipString(c);
                    _lineStart = false;
                    continue;
                }

                var atLineStart = _lineStart;
                _lineStart = false;
                if (atLineStart && _open.Count == 0 && c == '[')
                {
                    if (Header() is { } deepHeader)
                    {
                        return deepHeader;
                    }

                    continue;
                }

                var here = new SourceLocation(_line, _column);
                var level = _open.Count;
                switch (c)
                {
                    case '.' when _inKey:
                        _keyDots[level]++;
                        break;
                    case '=' when _inKey:
                        _inKey = false;
                        break;
                    case '[' when !_inKey:
                        _open.Add('[');
                        _keyDots.Add(0);
                        break;
                    case '{' when !_inKey:
                        _open.Add('{');
                        _keyDots.Add(0);
                        _inKey = true;
                        break;
                    case ']' or '}' when _open.Count > 0:
                        _open.RemoveAt(_open.Count - 1);
                        _keyDots.RemoveAt(_keyDots.Count - 1);
                        _inKey = false;
                        break;
                    case ',' when _open.Count > 0:
                        if (_open[^1] == '{')
                        {
                            _inKey = true;
                            _keyDots[^1] = 0;
                        }

                        break;
                }

                Advance();
                if (Depth() > max)
                {
                    return here;
                }
            }

            return null;
        }

        private int Depth()
        {
            var depth = 1 + _headerDepth + _open.Count;
            foreach (var dots in _keyDots)
            {
                depth += dots;
            }

            return depth;
        }

        /// <summary>A <c>[table]</c> or <c>[[array.of.tables]]</c> header: one level per name, one more for an array of tables.</summary>
        private SourceLocation? Header()
        {
            var here = new SourceLocation(_line, _column);
            Advance();
            var depth = 1;
            if (_pos < text.Length && text[_pos] == '[')
            {
                depth++;
                Advance();
            }

            while (_pos < text.Length && text[_pos] is not ']' and not '\n')
            {
                if (text[_pos] is '"' or '\'')
                {
                    SkipString(text[_pos]);
                    continue;
                }

                if (text[_pos] == '.')
                {
                    depth++;
                }

                Advance();
            }

            _headerDepth = depth;
            _keyDots[0] = 0;
            _inKey = false; // the rest of the header line holds no key
            return 1 + depth > max ? here : null;
        }

        private void SkipString(char quote)
        {
            var triple = _pos + 2 < text.Length && text[_pos + 1] == quote && text[_pos + 2] == quote;
            Advance(triple ? 3 : 1);
            while (_pos < text.Length)
            {
                var c = text[_pos];
                if (c == '\\' && quote == '"')
                {
                    Advance(Math.Min(2, text.Length - _pos));
                    continue;
                }

                if (c == quote && (!triple || (_pos + 2 < text.Length && text[_pos + 1] == quote && text[_pos + 2] == quote)))
                {
                    Advance(triple ? 3 : 1);
                    return;
                }

                if (c == '\n' && !triple)
                {
                    return; // an unclosed one-line string: the syntax check reports it
                }

                Advance();
            }
        }

        private void Advance(int count = 1)
        {
            for (var i = 0; i < count && _pos < text.Length; i++)
            {
                if (text[_pos] == '\n')
                {
                    _line++;
                    _column = 1;
                }
                else
                {
                    _column++;
                }

                _pos++;
            }
        }
    }
}
