namespace DriftWatch.Configuration;

/// <summary>The <c>name</c> of a source, pair or mailing list: required, usable, unique in its list.</summary>
internal static class NameSection
{
    /// <param name="seen">Names so far with the line they were declared on.</param>
    public static string? Read(MappingReader reader, string what, Dictionary<string, long> seen)
    {
        if (!reader.Has("name"))
        {
            _ = reader.Node("name");
            reader.Missing("name", $"is required: every {what} needs a name");
            return null;
        }

        var name = reader.Text("name");
        if (name is null)
        {
            return null;
        }

        if (Identifiers.CheckName(name) is { } problem)
        {
            reader.Error("name", problem);
            return null;
        }

        if (seen.TryGetValue(name, out var firstLine))
        {
            reader.Error("name", $"duplicate {what} name '{name}' (first declared on line {firstLine})");
            return null;
        }

        seen[name] = reader.MarkOf("name").Line;
        return name;
    }
}
