using DriftWatch.Core.Configuration;

namespace DriftWatch.Sources;

/// <summary>Creates the adapter for a source by its kind; the one place a new source kind is registered.</summary>
internal interface ISourceFactory
{
    IPairSource Create(SourceConfig source);
}
