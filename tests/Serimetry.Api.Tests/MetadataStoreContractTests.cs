using Serimetry.Api.Storage;

namespace Serimetry.Api.Tests;

/// <summary>
/// The metadata-store contract, run against both implementations: SQLite (a file) and PostgreSQL (a real server).
/// Src: the contract documented on <see cref="MetadataStore"/> (idempotent uploads, conditional state changes).
/// </summary>
[Collection("postgres")]
public sealed class MetadataStoreContractTests(PostgresFixture postgres) : IDisposable
{
    private readonly string _dir = Workflow.TempDir();

    public void Dispose() => Workflow.DeleteQuietly(_dir);

    private MetadataStore Open(string kind, string name = "shared") => kind == "sqlite"
        ? MetadataStore.Sqlite(Path.Combine(_dir, name + ".db"))
        : MetadataStore.Postgres(_pg ??= postgres.NewDatabase().ConnectionString);

    private string? _pg;

    [Theory]
    [InlineData("sqlite")]
    [InlineData("postgres")]
    public void Uploads_are_idempotent_and_keys_and_audit_round_trip(string kind)
    {
        using var store = Open(kind);
        Assert.Equal(kind, store.Kind);
        var first = store.AddStudy(new StudyRecord("s1", "P1", "2022-03-14", "nifti", "[]"));
        // Same id again (re-sent files): the stored row wins, nothing is overwritten.
        var again = store.AddStudy(new StudyRecord("s1", "P2", "2023-01-01", "dicom", "[1]"));
        Assert.Equal(first, again);
        Assert.Equal("P1", store.FindStudy("s1")!.PatientId);
        Assert.Null(store.FindStudy("nope"));
        store.AddMask(new MaskRecord("m1", "s1", "m1.nii.gz"));
        store.AddMask(new MaskRecord("m1", "s1", "other.nii"));
        Assert.Equal("m1.nii.gz", store.FindMask("m1")!.File);

        byte[] salt = [0, 1, 2, 255], hash = [.. Enumerable.Range(0, 32).Select(i => (byte)(i * 7))];
        store.AddKey(new KeyRecord("k1", "pacs", salt, hash));
        var key = store.FindKey("k1")!;
        Assert.Equal(salt, key.Salt);
        Assert.Equal(hash, key.Hash);

        for (int i = 0; i < 5; i++) store.Audit("pacs", "fetch-comparison", $"c{i}");
        Assert.Equal(["c0", "c1", "c2", "c3", "c4"], store.AuditLog().Select(a => a.Resource));
    }

    [Theory]
    [InlineData("sqlite")]
    [InlineData("postgres")]
    public void A_comparison_ends_once_even_when_attempts_race(string kind)
    {
        using var store = Open(kind);
        store.AddComparison("c1", "P1", "{}");
        store.AddComparison("c2", "P1", "{}");
        Assert.Equal(["c1", "c2"], store.ComparisonsOfPatient("P1").Select(c => c.Id));
        Assert.True(store.StartComparison("c1"));
        store.Progress("c1", "aligning visit 1", 42.5);
        var running = store.FindComparison("c1")!;
        Assert.Equal(("running", "aligning visit 1", 42.5, 1), (running.State, running.Stage, running.Percent, running.Runs));

        // Eight attempts (as on several nodes, each with its own store and connections) finish at once: exactly one wins.
        var stores = Enumerable.Range(0, 8).Select(_ => Open(kind)).ToList();
        var wins = new bool[8];
        Parallel.For(0, 8, i => wins[i] = stores[i].FinishComparison("c1", i % 2 == 0 ? "done" : "failed", i % 2 == 0 ? null : "{\"status\":500}"));
        stores.ForEach(s => s.Dispose());
        Assert.Single(wins, w => w);
        var ended = store.FindComparison("c1")!;
        int winner = Array.IndexOf(wins, true);
        Assert.Equal(winner % 2 == 0 ? "done" : "failed", ended.State);
        Assert.NotNull(ended.Finished);
        // Ended stays ended: no new attempt starts, no late attempt rewrites it.
        Assert.False(store.StartComparison("c1"));
        Assert.False(store.FinishComparison("c1", "done", null));
        Assert.Equal(1, store.FindComparison("c1")!.Runs);
        Assert.Equal("queued", store.FindComparison("c2")!.State);
    }
}
