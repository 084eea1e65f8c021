using System.Globalization;
using System.IO.Compression;
using System.Security;
using System.Text;

namespace TraceKin.Tests.Plates;

/// <summary>
/// Writes a minimal .xlsx workbook by hand (ExcelDataReader only reads): the four parts an SpreadsheetML package needs
/// — content types, package relationships, workbook with its relationships, and one worksheet part per sheet —
/// with numbers as numeric cells and text as inline strings (ECMA-376 Part 1, §18.3.1.4 c and §18.3.1.53 is, from
/// memory). For tests only.
/// </summary>
internal static class MinimalXlsx
{
    public static byte[] Write(params (string Name, IReadOnlyList<object?[]> Rows)[] sheets)
    {
        using var ms = new MemoryStream();
        using (var zip = new ZipArchive(ms, ZipArchiveMode.Create, leaveOpen: true))
        {
            void Part(string path, string xml)
            {
                using var w = new StreamWriter(zip.CreateEntry(path).Open(), new UTF8Encoding(false));
                w.Write(xml);
            }
            var overrides = string.Concat(sheets.Select((_, i) =>
                $"<Override PartName=\"/xl/worksheets/sheet{i + 1}.xml\" ContentType=\"application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml\"/>"));
            Part("[Content_Types].xml", "<?xml version=\"1.0\" encoding=\"UTF-8\" standalone=\"yes\"?><Types xmlns=\"http://schemas.openxmlformats.org/package/2006/content-types\">" +
                "<Default Extension=\"rels\" ContentType=\"application/vnd.openxmlformats-package.relationships+xml\"/><Default Extension=\"xml\" ContentType=\"application/xml\"/>" +
                "<Override PartName=\"/xl/workbook.xml\" ContentType=\"application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml\"/>" + overrides + "</Types>");
            Part("_rels/.rels", "<?xml version=\"1.0\" encoding=\"UTF-8\" standalone=\"yes\"?><Relationships xmlns=\"http://schemas.openxmlformats.org/package/2006/relationships\">" +
                "<Relationship Id=\"rId1\" Type=\"http://schemas.openxmlformats.org/officeDocument/2006/relationships/officeDocument\" Target=\"xl/workbook.xml\"/></Relationships>");
            Part("xl/workbook.xml", "<?xml version=\"1.0\" encoding=\"UTF-8\" standalone=\"yes\"?><workbook xmlns=\"http://schemas.openxmlformats.org/spreadsheetml/2006/main\" xmlns:r=\"http://schemas.openxmlformats.org/officeDocument/2006/relationships\"><sheets>" +
                string.Concat(sheets.Select((s, i) => $"<sheet name=\"{SecurityElement.Escape(s.Name)}\" sheetId=\"{i + 1}\" r:id=\"rId{i + 1}\"/>")) + "</sheets></workbook>");
            Part("xl/_rels/workbook.xml.rels", "<?xml version=\"1.0\" encoding=\"UTF-8\" standalone=\"yes\"?><Relationships xmlns=\"http://schemas.openxmlformats.org/package/2006/relationships\">" +
                string.Concat(sheets.Select((_, i) => $"<Relationship Id=\"rId{i + 1}\" Type=\"http://schemas.openxmlformats.org/officeDocument/2006/relationships/worksheet\" Target=\"worksheets/sheet{i + 1}.xml\"/>")) + "</Relationships>");
            for (var i = 0; i < sheets.Length; i++)
            {
                var sb = new StringBuilder("<?xml version=\"1.0\" encoding=\"UTF-8\" standalone=\"yes\"?><worksheet xmlns=\"http://schemas.openxmlformats.org/spreadsheetml/2006/main\"><sheetData>");
                for (var r = 0; r < sheets[i].Rows.Count; r++)
                {
                    sb.Append(CultureInfo.InvariantCulture, $"<row r=\"{r + 1}\">");
                    var row = sheets[i].Rows[r];
                    for (var c = 0; c < row.Length; c++)
                    {
                        var at = $"{Letters(c)}{r + 1}";
                        switch (row[c])
                        {
                            case null: break;
                            case double d: sb.Append(CultureInfo.InvariantCulture, $"<c r=\"{at}\"><v>{d.ToString("R", CultureInfo.InvariantCulture)}</v></c>"); break;
                            case var o: sb.Append(CultureInfo.InvariantCulture, $"<c r=\"{at}\" t=\"inlineStr\"><is><t>{SecurityElement.Escape(o.ToString())}</t></is></c>"); break;
                        }
                    }
                    sb.Append("</row>");
                }
                sb.Append("</sheetData></worksheet>");
                Part($"xl/worksheets/sheet{i + 1}.xml", sb.ToString());
            }
        }
        return ms.ToArray();
    }

    private static string Letters(int index)
    {
        var s = "";
        for (var n = index + 1; n > 0; n = (n - 1) / 26) s = (char)('A' + (n - 1) % 26) + s;
        return s;
    }
}
