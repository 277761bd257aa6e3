namespace DriftWatch.Core.Discovery;

/// <summary>One column of a table as the engine's catalogue lists it, in catalogue order.</summary>
/// <param name="Type">The declared type as the engine writes it ("double precision", "INTEGER").</param>
/// <param name="Numeric">Whether its values are numbers DriftWatch can read (the source kind decides from the type).</param>
public sealed record CatalogueColumn(string Name, string Type, bool Numeric);
