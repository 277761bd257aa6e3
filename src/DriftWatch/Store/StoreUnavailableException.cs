namespace DriftWatch.Store;

/// <summary>DriftWatch's own store could not be opened or migrated. The message names the store kind, never its connection string.</summary>
internal sealed class StoreUnavailableException(string message, Exception innerException) : Exception(message, innerException);
