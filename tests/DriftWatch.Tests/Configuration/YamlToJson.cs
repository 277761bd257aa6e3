using System.Globalization;
using System.Text.Json.Nodes;
using YamlDotNet.Core;
using YamlDotNet.RepresentationModel;

namespace DriftWatch.Tests.Configuration;

/// <summary>
/// YAML to JSON the way an editor's YAML language server hands a file to a JSON Schema: plain scalars
/// typed by the YAML 1.2 core schema (integers, floats, true/false, null), quoted scalars as strings.
/// </summary>
internal static class YamlToJson
{
    public static JsonNode? Convert(string yaml)
    {
        var stream = new YamlStream();
        stream.Load(new StringReader(yaml));
        return Node(stream.Documents[0].RootNode);
    }

    private static JsonNode? Node(YamlNode node) => node switch
    {
        YamlMappingNode mapping => new JsonObject(mapping.Children.Select(c => KeyValuePair.Create(((YamlScalarNode)c.Key).Value!, Node(c.Value)))),
        YamlSequenceNode sequence => new JsonArray([.. sequence.Children.Select(Node)]),
        YamlScalarNode scalar => Scalar(scalar),
        _ => throw new NotSupportedException(node.GetType().Name),
    };

    private static JsonValue? Scalar(YamlScalarNode scalar)
    {
        var text = scalar.Value ?? string.Empty;
        if (scalar.Style is not (ScalarStyle.Plain or ScalarStyle.Any))
        {
            return JsonValue.Create(text);
        }

        if (text is "" or "~" or "null" or "Null" or "NULL")
        {
            return null;
        }

        if (text is "true" or "True" or "TRUE" or "false" or "False" or "FALSE")
        {
            return JsonValue.Create(text.StartsWith('t') || text.StartsWith('T'));
        }

        if (long.TryParse(text, NumberStyles.AllowLeadingSign, CultureInfo.InvariantCulture, out var whole))
        {
            return JsonValue.Create(whole);
        }

        if (double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out var number) && double.IsFinite(number))
        {
            return JsonValue.Create(number);
        }

        return JsonValue.Create(text);
    }
}
