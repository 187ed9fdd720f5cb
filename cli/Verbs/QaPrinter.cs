using System.Globalization;
using Serimetry.Engine.Repeatability;

namespace Serimetry.Cli.Verbs;

/// <summary>Console summaries of the qa sub-commands.</summary>
internal static class QaPrinter
{
    public static void PrintTestRetest(TextWriter w, TestRetestReport report)
    {
        w.WriteLine($"{"measure",-26} {"n",4} {"k",3} {"mean",12} {"wSD",10} {"wCV",7} {"RC",10} {"ICC(2,1)",9} {"ICC(3,1)",9}");
        foreach (var m in report.Measures)
        {
            w.WriteLine(string.Create(CultureInfo.InvariantCulture,
                $"{m.Measure,-26} {m.NSubjects,4} {m.NRepeats,3} {m.Mean,12:G5} {m.WithinSubjectSd,10:G4} {Pct(m.WithinSubjectCv),7} {m.Rc,10:G4} {Num(m.Icc.Icc21.Value),9} {Num(m.Icc.Icc31.Value),9}"));
            foreach (var n in m.Notes) w.WriteLine($"    note: {n}");
        }
    }

    private static string Pct(double? v) => v is double d ? (100 * d).ToString("F1", CultureInfo.InvariantCulture) + "%" : "-";

    private static string Num(double? v) => v is double d ? d.ToString("F3", CultureInfo.InvariantCulture) : "-";
}
