using Serimetry.Tests.Shared;

namespace Serimetry.Api.Tests;

/// <summary>One throwaway PostgreSQL server (Debian's postgresql) for the tests of the <c>postgres</c> collection; a database per test.</summary>
public sealed class PostgresFixture : IDisposable
{
    public PostgresCluster Cluster { get; } = PostgresCluster.Start();

    /// <summary>A fresh database; returns its connection string and name.</summary>
    public (string ConnectionString, string Name) NewDatabase()
    {
        string name = "t_" + Guid.NewGuid().ToString("N")[..12];
        return (Cluster.CreateDatabase(name), name);
    }

    public void Dispose() => Cluster.Dispose();
}

/// <summary>Tests sharing the PostgreSQL server; they run one after another (the server and the two cores are shared).</summary>
[CollectionDefinition("postgres")]
public sealed class PostgresCollection : ICollectionFixture<PostgresFixture>;
