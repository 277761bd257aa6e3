using YamlDotNet.Core;
using YamlDotNet.Core.Events;

namespace DriftWatch.Configuration;

/// <summary>
/// A first pass over the YAML events, before any tree is built. YamlDotNet's representation model shares an
/// anchored node between its aliases, so an alias bomb ("billion laughs") loads small but explodes when
/// walked, and its loader recurses once per nesting level. This pass counts every node as often as aliases
/// would make a reader visit it, stops at a budget, refuses alias cycles and deep nesting, and turns the
/// parser's errors into positioned messages. It is linear in the size of the text.
/// </summary>
internal static class YamlGuard
{
    /// <summary>Far above any real configuration (a thousand pairs are about 30 000 nodes).</summary>
    public const long MaxExpandedNodes = 100_000;

    public const int MaxDepth = 64;

    /// <summary>True when the text may be loaded; otherwise one error was added.</summary>
    public static bool Check(string yamlText, ConfigContext context)
    {
        var sizes = new Dictionary<string, long>(StringComparer.Ordinal);
        var open = new Stack<(string? Anchor, long Size)>();
        var openAnchors = new HashSet<string>(StringComparer.Ordinal);
        long expanded = 0;
        var documents = 0;
        var last = Mark.Empty;
        var parser = new Parser(new StringReader(yamlText));
        try
        {
            while (parser.MoveNext())
            {
                var current = parser.Current!;
                last = current.Start;
                switch (current)
                {
                    case DocumentStart:
                        documents++;
                        break;
                    case Scalar scalar:
                        Count(1);
                        AddToParent(1);
                        Remember(scalar.Anchor, 1);
                        break;
                    case NodeEvent node when current is MappingStart or SequenceStart:
                        if (open.Count >= MaxDepth)
                        {
                            context.Error(current.Start, ConfigContext.FileKey, $"nesting deeper than {MaxDepth} levels; a configuration never needs that much");
                            return false;
                        }

                        Count(1);
                        var anchor = node.Anchor.IsEmpty ? null : node.Anchor.Value;
                        if (anchor is not null)
                        {
                            openAnchors.Add(anchor);
                        }

                        open.Push((anchor, 1));
                        break;
                    case MappingEnd or SequenceEnd:
                        var (closing, size) = open.Pop();
                        if (closing is not null)
                        {
                            openAnchors.Remove(closing);
                            sizes[closing] = size;
                        }

                        AddToParent(size);
                        break;
                    case AnchorAlias alias:
                        var name = alias.Value.Value;
                        if (openAnchors.Contains(name))
                        {
                            context.Error(current.Start, ConfigContext.FileKey, $"alias *{name} refers to a node that contains it; cycles are not allowed");
                            return false;
                        }

                        if (!sizes.TryGetValue(name, out var aliasSize))
                        {
                            context.Error(current.Start, ConfigContext.FileKey, $"alias *{name} refers to no anchor &{name} before it");
                            return false;
                        }

                        Count(aliasSize);
                        AddToParent(aliasSize);
                        break;
                }

                if (expanded > MaxExpandedNodes)
                {
                    context.Error(current.Start, ConfigContext.FileKey,
                        $"the document expands to more than {MaxExpandedNodes} YAML nodes (each alias counted at every use); refused as a probable alias bomb");
                    return false;
                }
            }
        }
        catch (YamlException ex)
        {
            context.Error(ex.Start, ConfigContext.FileKey, $"YAML syntax: {ex.Message}");
            return false;
        }
        catch (InvalidOperationException)
        {
            // YamlDotNet's scanner throws this on some malformed input (an unclosed flow sequence followed
            // by an unterminated quote, for one) instead of a YamlException.
            context.Error(last, ConfigContext.FileKey, "YAML syntax: the text after this point could not be read (an unclosed bracket or quote?)");
            return false;
        }

        if (documents > 1)
        {
            context.Error(1, 1, ConfigContext.FileKey, "the file holds more than one YAML document ('---'); put everything in one");
            return false;
        }

        return true;

        void Count(long n) => expanded += n;

        void AddToParent(long n)
        {
            if (open.Count > 0)
            {
                var (anchor, size) = open.Pop();
                open.Push((anchor, size + n));
            }
        }

        void Remember(AnchorName anchor, long size)
        {
            if (!anchor.IsEmpty)
            {
                sizes[anchor.Value] = size;
            }
        }
    }
}
