using System.Reflection;
using System.Reflection.Emit;

namespace DriftWatch.Tests.Architecture;

/// <summary>
/// The seams of the main assembly, kept by the build rather than a document: the store knows Core only, never the
/// alert path; the demo never reaches into the CLI's commands; monitoring ends at "run recorded" and does not
/// decide alerts. Every type of a namespace is read, its signatures and the members its method bodies use (the IL
/// of async state machines and lambdas too: the compiler nests them in the same namespace).
/// </summary>
public sealed class LayeringTests
{
    private static readonly Assembly Main = typeof(DriftWatch.Store.IAlertStore).Assembly;

    [Theory]
    [InlineData("DriftWatch.Store", "DriftWatch.Alerting")]
    [InlineData("DriftWatch.Store", "DriftWatch.Monitoring")]
    [InlineData("DriftWatch.Store", "DriftWatch.Dashboard")]
    [InlineData("DriftWatch.Store", "DriftWatch.Cli")]
    [InlineData("DriftWatch.Store", "DriftWatch.Triage")]
    [InlineData("DriftWatch.Demo", "DriftWatch.Cli")]
    [InlineData("DriftWatch.Alerting", "DriftWatch.Cli")]
    [InlineData("DriftWatch.Alerting", "DriftWatch.Dashboard")]
    [InlineData("DriftWatch.Monitoring", "DriftWatch.Alerting")]
    [InlineData("DriftWatch.Output", "DriftWatch.Cli")]
    [InlineData("DriftWatch.Hosting", "DriftWatch.Cli")]
    public void Namespace_DoesNotUse(string from, string forbidden)
    {
        var offences = TypesIn(from)
            .SelectMany(t => UsedTypes(t).Where(u => InNamespace(u, forbidden)).Select(u => $"{t.FullName} uses {u.FullName}"))
            .Distinct(StringComparer.Ordinal)
            .ToList();

        Assert.NotEmpty(TypesIn(from));
        Assert.Empty(offences);
    }

    [Fact]
    public void Scanner_FindsAUseInsideAnAsyncMethodBody()
    {
        // The check above must see what it is meant to see: the evaluation (Alerting) calls the alert store only
        // inside async method bodies, and its decisions reach the store's types.
        var used = TypesIn("DriftWatch.Alerting.Evaluation").SelectMany(UsedTypes).ToHashSet();

        Assert.Contains(typeof(DriftWatch.Store.RunFeed), used);
        Assert.Contains(typeof(DriftWatch.Store.IAlertStore), used);
    }

    [Fact]
    public void CoreAssembly_DoesNotReferenceTheMainAssembly() =>
        Assert.DoesNotContain(typeof(DriftWatch.Core.Alerting.AlertState).Assembly.GetReferencedAssemblies(), a => a.Name == Main.GetName().Name);

    private static bool InNamespace(Type type, string ns) =>
        type.Namespace is { } n && (n == ns || n.StartsWith(ns + ".", StringComparison.Ordinal));

    private static List<Type> TypesIn(string ns) => [.. Main.GetTypes().Where(t => InNamespace(t, ns))];

    private const BindingFlags All = BindingFlags.Public | BindingFlags.NonPublic | BindingFlags.Instance | BindingFlags.Static | BindingFlags.DeclaredOnly;

    private static IEnumerable<Type> UsedTypes(Type type)
    {
        var found = new HashSet<Type>();
        void Add(Type? t)
        {
            if (t is null || !found.Add(t))
            {
                return;
            }

            if (t.HasElementType)
            {
                Add(t.GetElementType());
            }

            if (t.IsGenericType && !t.IsGenericTypeDefinition)
            {
                foreach (var a in t.GetGenericArguments())
                {
                    Add(a);
                }
            }
        }

        Add(type.BaseType);
        foreach (var i in type.GetInterfaces())
        {
            Add(i);
        }

        foreach (var f in type.GetFields(All))
        {
            Add(f.FieldType);
        }

        foreach (var p in type.GetProperties(All))
        {
            Add(p.PropertyType);
        }

        foreach (var m in type.GetMethods(All).Cast<MethodBase>().Concat(type.GetConstructors(All)))
        {
            if (m is MethodInfo mi)
            {
                Add(mi.ReturnType);
            }

            foreach (var p in m.GetParameters())
            {
                Add(p.ParameterType);
            }

            foreach (var t in BodyTypes(m))
            {
                Add(t);
            }
        }

        return found;
    }

    // Opcodes by value, from the runtime's own table, to walk IL with the right operand sizes.
    private static readonly Dictionary<short, OpCode> OpCodesByValue = typeof(OpCodes)
        .GetFields(BindingFlags.Public | BindingFlags.Static)
        .Select(f => (OpCode)f.GetValue(null)!)
        .ToDictionary(o => o.Value);

    private static IEnumerable<Type> BodyTypes(MethodBase method)
    {
        var il = method.GetMethodBody()?.GetILAsByteArray();
        if (il is null)
        {
            yield break;
        }

        var genericType = method.DeclaringType is { IsGenericType: true } d ? d.GetGenericArguments() : null;
        var genericMethod = method.IsGenericMethod ? method.GetGenericArguments() : null;
        var at = 0;
        while (at < il.Length)
        {
            short value = il[at] == 0xFE ? (short)(0xFE00 | il[at + 1]) : il[at];
            at += il[at] == 0xFE ? 2 : 1;
            var op = OpCodesByValue[value];
            switch (op.OperandType)
            {
                case OperandType.InlineNone:
                    break;
                case OperandType.ShortInlineBrTarget or OperandType.ShortInlineI or OperandType.ShortInlineVar:
                    at += 1;
                    break;
                case OperandType.InlineVar:
                    at += 2;
                    break;
                case OperandType.InlineI8 or OperandType.InlineR:
                    at += 8;
                    break;
                case OperandType.InlineSwitch:
                    at += 4 + (4 * BitConverter.ToInt32(il, at));
                    break;
                case OperandType.InlineField or OperandType.InlineMethod or OperandType.InlineType or OperandType.InlineTok:
                    var token = BitConverter.ToInt32(il, at);
                    at += 4;
                    var member = Resolve(method.Module, token, genericType, genericMethod);
                    if (member is Type t)
                    {
                        yield return t;
                    }
                    else if (member?.DeclaringType is { } owner)
                    {
                        yield return owner;
                        if (member is FieldInfo field)
                        {
                            yield return field.FieldType;
                        }
                    }

                    break;
                default:
                    at += 4;
                    break;
            }
        }
    }

    private static MemberInfo? Resolve(Module module, int token, Type[]? genericType, Type[]? genericMethod)
    {
        try
        {
            return module.ResolveMember(token, genericType, genericMethod);
        }
        catch (ArgumentException)
        {
            // A member of another module's generic instantiation the runtime cannot bind here: its owner is not ours.
            return null;
        }
    }
}
