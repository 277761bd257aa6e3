using DriftWatch.Alerting.Digest;
using DriftWatch.Core.Configuration;

namespace DriftWatch.Alerting.Routing;

/// <summary>The items one mailing list receives in one cycle: they become one message.</summary>
internal sealed record AddressedDigest(MailingListConfig List, IReadOnlyList<DigestItem> Items);
