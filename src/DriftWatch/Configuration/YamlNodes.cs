using YamlDotNet.Core;
using YamlDotNet.RepresentationModel;

namespace DriftWatch.Configuration;

internal static class YamlNodes
{
    /// <summary>YAML's null: an empty plain value, <c>~</c> or <c>null</c>. A key with a null value counts as absent.</summary>
    public static bool IsNull(YamlNode? node) =>
        node is null
        || (node is YamlScalarNode { Style: ScalarStyle.Plain or ScalarStyle.Any } scalar
            && scalar.Value is null or "" or "~" or "null" or "Null" or "NULL");

    public static string Describe(YamlNode node) => node switch
    {
        YamlMappingNode => "a mapping",
        YamlSequenceNode => "a list",
        _ => "a single value",
    };
}
