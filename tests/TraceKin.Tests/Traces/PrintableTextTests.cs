using TraceKin.Traces;

namespace TraceKin.Tests.Traces;

// Control characters from input files shown as visible escapes. Code points from the Unicode standard's C0/C1 control
// ranges and its bidirectional formatting characters (Unicode Standard Annex #9, "explicit directional formatting").
public class PrintableTextTests
{
    [Theory]
    [InlineData("R1", "R1")]
    [InlineData("R\u001B[31m1", @"R\x1B[31m1")]
    [InlineData("bell\u0007", @"bell\x07")]
    [InlineData("nul\u0000", @"nul\x00")]
    [InlineData("two\nlines\r", @"two\x0Alines\x0D")]
    [InlineData("tab\there", @"tab\x09here")]
    [InlineData("del\u007F", @"del\x7F")]
    [InlineData("csi\u009B2J", @"csi\x9B2J")]
    [InlineData("ab\u202Ecba", @"ab\u202Ecba")]
    [InlineData("line\u2028sep", @"line\u2028sep")]
    [InlineData("µmol/L, °C, Ä, ✓", "µmol/L, °C, Ä, ✓")]
    [InlineData(@"C:\data\r1.csv", @"C:\data\r1.csv")]
    public void Control_characters_become_visible_escapes_and_other_text_is_kept(string text, string shown) =>
        Assert.Equal(shown, PrintableText.Escape(text));

    [Fact]
    public void Text_without_control_characters_is_returned_as_the_same_string()
    {
        var text = "plan.csv:3:5: found \"r1.csv\"";
        Assert.Same(text, PrintableText.Escape(text));
    }
}
