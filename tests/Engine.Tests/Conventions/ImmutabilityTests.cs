using System.Reflection;
using System.Runtime.CompilerServices;
using LatticeSweep.Engine.Models;

namespace LatticeSweep.Engine.Tests.Conventions;

/// <summary>Models and results are immutable: no public settable property (init-only is fine) and no public mutable field.</summary>
public class ImmutabilityTests
{
    private static readonly string[] ValueNamespaces =
    [
        "LatticeSweep.Engine.Models", "LatticeSweep.Engine.Results", "LatticeSweep.Engine.Samples",
        "LatticeSweep.Engine.Springs", "LatticeSweep.Engine.Builders", "LatticeSweep.Engine.Elastic",
        "LatticeSweep.Engine.Solving", "LatticeSweep.Engine.Errors", "LatticeSweep.Engine.Transport",
    ];

    public static TheoryData<Type> PublicValueTypes()
    {
        var data = new TheoryData<Type>();
        foreach (var type in typeof(CrystalModel).Assembly.GetExportedTypes()
                     .Where(t => ValueNamespaces.Contains(t.Namespace) && !t.IsEnum && !t.IsInterface && !typeof(Exception).IsAssignableFrom(t)
                                 && !(t.IsAbstract && t.IsSealed)))
        {
            data.Add(type);
        }

        return data;
    }

    [Theory]
    [MemberData(nameof(PublicValueTypes))]
    public void Public_model_and_result_types_cannot_be_changed_after_construction(Type type)
    {
        Assert.Empty(MutableMembers(type));
    }

    [Fact]
    public void The_check_finds_a_settable_property_and_a_mutable_field()
    {
        Assert.Equal(["Settable", "Field"], MutableMembers(typeof(Mutable)));
        Assert.Empty(MutableMembers(typeof(Immutable)));
    }

    private static List<string> MutableMembers(Type type)
    {
        var found = new List<string>();
        foreach (var property in type.GetProperties(BindingFlags.Public | BindingFlags.Instance))
        {
            var setter = property.SetMethod;
            if (setter is { IsPublic: true } && !setter.ReturnParameter.GetRequiredCustomModifiers().Contains(typeof(IsExternalInit)))
            {
                found.Add(property.Name);
            }
        }

        found.AddRange(type.GetFields(BindingFlags.Public | BindingFlags.Instance).Where(f => !f.IsInitOnly).Select(f => f.Name));
        return found;
    }

#pragma warning disable CA1051, CS0649 // deliberately mutable: the check must catch it
    private sealed class Mutable
    {
        public int Field;

        public int Settable { get; set; }
    }
#pragma warning restore CA1051, CS0649

    private sealed record Immutable(int Value)
    {
        public int Other { get; init; }
    }
}
