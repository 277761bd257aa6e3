namespace DriftWatch.Tests.Dashboard;

/// <summary>One scenario store (with the hostile pair) and one running dashboard, shared by the read-only HTTP tests.</summary>
public sealed class DashboardFixture : IAsyncLifetime
{
    internal DashboardScenario Scenario { get; private set; } = null!;

    internal DashboardHost Host { get; private set; } = null!;

    public async Task InitializeAsync()
    {
        Scenario = await DashboardScenario.CreateAsync(hostile: true);
        Host = await DashboardHost.StartAsync(Scenario);
    }

    public async Task DisposeAsync()
    {
        await Host.DisposeAsync();
        await Scenario.DisposeAsync();
    }
}

[CollectionDefinition(Name)]
public sealed class DashboardScenarioGroup : ICollectionFixture<DashboardFixture>
{
    public const string Name = "dashboard scenario";
}
