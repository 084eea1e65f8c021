using System.Text;
using TraceKin.Ingest;
using TraceKin.Traces;

namespace TraceKin.Tests.Ingest;

// Robustness: mutated copies of valid (invented) exports must either read or fail with one located InputException —
// never another exception type, never a hang. Fixed seed, so a failure is reproducible from its variant number.
public class FuzzTests
{
    private static readonly string[] Valid =
    [
        "instrument: bench photometer\nmixed at: -2 s\ntime (s),A520,A700 ref,T (°C)\n0,0.812,0.010,25.0\n1.5,0.790,0.011,25.1\n3,0.751,0.010,25.1\n4.5,0.707,0.012,25.2\n6,0.690,0.011,25.2\nEnd of data\n",
        "# gas burette\r\nt [min];V (mL)\r\n0;0,00\r\n0,5;1,25\r\n1;2,40\r\n1,5;3,38\r\n2;4,20\r\n",
        "time\tp [kPa]\tpH\n00:00.0\t101.3\t7.00\n00:30.5\t104.2\t6.95\n01:01.0\t106.8\t6.91\n01:31.5\t109.1\t6.88\n",
        "\"timestamp\",\"κ (mS/cm)\"\n\"2026-03-01T23:59:50+01:00\",\"1,25\"\n\"2026-03-02T00:00:10+01:00\",\"1,31\"\n\"2026-03-02T00:00:30+01:00\",\"1,36\"\n",
        "##TITLE=fading band\n##JCAMP-DX=4.24\n##XUNITS=SECONDS\n##YUNITS=ABSORBANCE\n##YFACTOR=0.001\n##FIRSTX=0\n##LASTX=70\n##NPOINTS=8\n##XYDATA=(X++(Y..Y))\n0A000k0j9j8\n30I43j7Tj6T\n##END=\n",
        "time (s),0\n,1,2,3\nA,0.10,0.11,0.12\nB,0.20,0.21,0.22\n\ntime (s),30\n,1,2,3\nA,0.13,0.14,0.15\nB,0.23,0.24,0.25\n\ntime (s),60\n,1,2,3\nA,0.16,0.17,0.18\nB,0.26,0.27,0.28\n",
        "time (min);A1;A02;B1 (AU)\n0;0,10;0,20;0,30\n0,5;0,11;0,21;0,31\n1;0,12;0,22;0,32\n1,5;0,13;0,23;0,33\n",
        "##TITLE=burette\n##JCAMP-DX=5.01\n##XUNITS=MINUTES\n##YUNITS=ML\n##NPOINTS=4\n##FIRSTX=0\n##LASTX=3\n##XYPOINTS=(XY..XY)\n0, 0; 1, 1.2\n2, 2.3; 3, 3.3\n##END=\n",
    ];

    private static readonly byte[] Inserts = "\0,;\t\"\n\r#.-:eE+@%jJsS 9"u8.ToArray();

    [Fact]
    public void Ten_thousand_mutated_exports_fail_only_with_located_input_errors()
    {
        foreach (var text in Valid) ExportReader.FromText(text, "valid", IngestSettings.Default); // the bases themselves read

        var rng = new Random(424242);
        var read = 0;
        var rejected = 0;
        for (var variant = 0; variant < 12_000; variant++)
        {
            var bytes = new List<byte>(Encoding.UTF8.GetBytes(Valid[variant % Valid.Length]));
            var edits = 1 + rng.Next(3);
            for (var e = 0; e < edits && bytes.Count > 0; e++)
            {
                var at = rng.Next(bytes.Count);
                switch (rng.Next(6))
                {
                    case 0: bytes[at] ^= (byte)(1 << rng.Next(8)); break;                         // bit flip
                    case 1: bytes.RemoveRange(at, bytes.Count - at); break;                       // truncation
                    case 2: bytes.Insert(at, Inserts[rng.Next(Inserts.Length)]); break;           // inserted delimiter, quote, NUL…
                    case 3: bytes.RemoveAt(at); break;                                            // dropped byte
                    case 4: bytes[at] = (byte)rng.Next(256); break;                               // random byte
                    default: bytes.InsertRange(at, bytes.GetRange(at, Math.Min(12, bytes.Count - at))); break; // repeated run
                }
            }
            try
            {
                var run = ExportReader.FromBytes(bytes.ToArray(), $"variant-{variant}.csv", IngestSettings.Default);
                Assert.NotEmpty(run.Channels);
                Assert.All(run.Channels, c => Assert.True(c.Count >= 1 && c.Times.All(double.IsFinite) && c.Values.All(double.IsFinite)));
                read++;
            }
            catch (InputException ex)
            {
                Assert.Equal($"variant-{variant}.csv", ex.Problem.File);
                Assert.True(ex.Problem.Line >= 1, $"variant {variant}: no line in \"{ex.Problem.Message}\"");
                Assert.True(ex.Problem.Column >= 1, $"variant {variant}: no column in \"{ex.Problem.Message}\"");
                rejected++;
            }
            catch (Exception ex)
            {
                Assert.Fail($"variant {variant} threw {ex.GetType().Name}: {ex.Message}\n{Encoding.UTF8.GetString(bytes.ToArray())}");
            }
        }
        // both outcomes occur, so the mutations neither all break nor all miss the files
        Assert.True(read > 500 && rejected > 500, $"read {read}, rejected {rejected}");
    }

    [Fact]
    public void The_single_pass_reader_and_the_general_reader_give_identical_numbers()
    {
        // Quoting every cell sends each row through the general path; the plain file takes the single-pass path.
        var rng = new Random(7);
        var plain = new StringBuilder("time (s),A520,V (mL)\n");
        var quoted = new StringBuilder("time (s),A520,V (mL)\n");
        for (var i = 0; i < 2000; i++)
        {
            var t = (i * 0.25).ToString("R", System.Globalization.CultureInfo.InvariantCulture);
            var a = (rng.NextDouble() * 1.5).ToString("R", System.Globalization.CultureInfo.InvariantCulture);
            var v = (-rng.NextDouble() * 1e-3).ToString("E6", System.Globalization.CultureInfo.InvariantCulture);
            plain.Append($"{t},{a},{v}\n");
            quoted.Append($"\"{t}\",\"{a}\",\"{v}\"\n");
        }
        var fast = ExportReader.FromText(plain.ToString(), "plain.csv", IngestSettings.Default);
        var slow = ExportReader.FromText(quoted.ToString(), "quoted.csv", IngestSettings.Default);
        Assert.Equal(slow.Channels[0].Times, fast.Channels[0].Times);
        Assert.Equal(slow.Channels[0].Values, fast.Channels[0].Values);
        Assert.Equal(slow.Channels[1].Values, fast.Channels[1].Values);
    }
}
