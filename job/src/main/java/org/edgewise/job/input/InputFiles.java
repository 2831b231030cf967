package org.edgewise.job.input;

import java.io.BufferedReader;
import java.io.FileNotFoundException;
import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;
import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.FileStatus;
import org.apache.hadoop.fs.FileSystem;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.compress.CompressionCodec;
import org.apache.hadoop.io.compress.CompressionCodecFactory;
import org.edgewise.driver.CsvFields;
import org.edgewise.driver.UserError;

/**
 * Resolves the {@code --input} arguments to data files through Hadoop's FileSystem (so any URI
 * Spark supports works: local paths, {@code file:}, {@code hdfs:}, {@code s3a:} …), decides the
 * format and reads CSV header lines. Every failure is a {@link UserError} naming the input.
 */
public final class InputFiles {
    private InputFiles() {
    }

    /** One resolved data file: the argument it came from, its full URI, and its format. */
    public record DataFile(String argument, String uri, String format) {
    }

    /** Resolves every argument; a directory stands for its visible files (sorted by name). */
    public static List<DataFile> resolve(List<String> inputs, String format, Configuration conf) {
        if (inputs.isEmpty()) {
            throw new UserError("no --input given");
        }
        List<DataFile> out = new ArrayList<>();
        for (String arg : inputs) {
            Path p = new Path(arg);
            localKind(arg, p);
            try {
                FileSystem fs = p.getFileSystem(conf);
                if (!fs.exists(p)) {
                    throw new UserError("input " + arg + ": no such file or directory");
                }
                FileStatus st = fs.getFileStatus(p);
                List<FileStatus> files = new ArrayList<>();
                if (st.isDirectory()) {
                    for (FileStatus c : fs.listStatus(p)) {
                        String name = c.getPath().getName();
                        if (c.isFile() && !name.startsWith(".") && !name.startsWith("_")) {
                            files.add(c);
                        }
                    }
                    files.sort(Comparator.comparing(c -> c.getPath().getName()));
                    if (files.isEmpty()) {
                        throw new UserError("input " + arg + ": the directory holds no data files");
                    }
                } else {
                    files.add(st);
                }
                for (FileStatus f : files) {
                    out.add(new DataFile(arg, f.getPath().toString(), formatOf(arg, f.getPath().getName(), format)));
                }
            } catch (IOException e) {
                throw new UserError("input " + arg + ": cannot read (" + oneLine(e) + ")");
            }
        }
        String first = out.get(0).format();
        for (DataFile f : out) {
            if (!f.format().equals(first) && f.argument().equals(out.get(0).argument())) {
                throw new UserError("input " + f.argument() + " holds " + first + " and " + f.format() + " files ("
                        + display(out.get(0)) + ", " + display(f) + "); give inputs of one format");
            }
            if (!f.format().equals(first)) {
                throw new UserError("input " + f.argument() + " is " + f.format() + " but " + out.get(0).argument()
                        + " is " + first + "; give inputs of one format");
            }
        }
        return out;
    }

    /**
     * A local input that is not a file or a directory is named for what it is: a FIFO or a device
     * would block or never end, and a loop of symbolic links leads nowhere.
     */
    static void localKind(String arg, Path p) {
        String scheme = p.toUri().getScheme();
        if (scheme != null && !scheme.equals("file")) {
            return;
        }
        java.nio.file.Path local;
        try {
            local = java.nio.file.Paths.get(p.toUri().getPath());
        } catch (RuntimeException e) {
            return; // the filesystem's own check names it
        }
        java.nio.file.attribute.BasicFileAttributes a;
        try {
            a = java.nio.file.Files.readAttributes(local, java.nio.file.attribute.BasicFileAttributes.class);
        } catch (java.nio.file.NoSuchFileException e) {
            return; // "no such file or directory", below
        } catch (java.nio.file.FileSystemException e) {
            if (String.valueOf(e.getReason()).contains("symbolic links")) {
                throw new UserError("input " + arg + " is a loop of symbolic links, not a file");
            }
            return;
        } catch (IOException e) {
            return;
        }
        if (a.isRegularFile() || a.isDirectory()) {
            return;
        }
        String kind = "not a regular file";
        try {
            int mode = (Integer) java.nio.file.Files.getAttribute(local, "unix:mode");
            kind = switch (mode & 0170000) {
                case 0010000 -> "a FIFO";
                case 0020000 -> "a character device";
                case 0060000 -> "a block device";
                case 0140000 -> "a socket";
                default -> kind;
            };
        } catch (IOException | UnsupportedOperationException | IllegalArgumentException | ClassCastException e) {
            // keep the general word
        }
        throw new UserError("input " + arg + " is " + kind + ", not a file");
    }

    static String formatOf(String arg, String fileName, String format) {
        String f = format.toLowerCase(Locale.ROOT);
        if (f.equals("csv") || f.equals("parquet")) {
            return f;
        }
        if (!f.equals("auto")) {
            throw new UserError("--format must be csv, parquet or auto, got '" + format + "'");
        }
        String n = fileName.toLowerCase(Locale.ROOT);
        if (n.endsWith(".parquet") || n.endsWith(".parq")) {
            return "parquet";
        }
        if (n.endsWith(".csv") || n.endsWith(".csv.gz") || n.endsWith(".tsv") || n.endsWith(".tsv.gz") || n.endsWith(".txt")
                || n.endsWith(".csv.bz2")) {
            return "csv";
        }
        throw new UserError("input " + arg + ": cannot tell the format of " + fileName
                + " from its name; pass --format csv or --format parquet");
    }

    /**
     * The header of a CSV file: its column names, checked (not empty, no blank or duplicate names).
     */
    public static List<String> csvHeader(DataFile file, char delimiter, Configuration conf) {
        return csvHeader(file, delimiter, StandardCharsets.UTF_8, conf);
    }

    /** As {@link #csvHeader(DataFile, char, Configuration)}; bytes not valid in {@code encoding} are refused. */
    public static List<String> csvHeader(DataFile file, char delimiter, java.nio.charset.Charset encoding,
                                         Configuration conf) {
        String line;
        Path p = new Path(file.uri());
        try {
            FileSystem fs = p.getFileSystem(conf);
            CompressionCodec codec = new CompressionCodecFactory(conf).getCodec(p);
            try (InputStream raw = fs.open(p);
                 InputStream in = new java.io.BufferedInputStream(codec == null ? raw : codec.createInputStream(raw))) {
                // only the header's own bytes are decoded (strictly): a bad byte further down is named
                // with its line by the full read, not blamed on line 1
                line = nextLine(in, encoding);
                while (line != null && line.isBlank()) {
                    line = nextLine(in, encoding);
                }
            }
        } catch (LongLine e) {
            if (e.carriageReturns) {
                throw crOnly(file);
            }
            throw new UserError("input " + display(file) + " line 1: the header line is longer than "
                    + String.format(Locale.ROOT, "%,d", MAX_HEADER_BYTES) + " bytes (1 MiB) without a line break;"
                    + " a CSV file starts with one line naming its columns");
        } catch (java.nio.charset.CharacterCodingException e) {
            throw new UserError("input " + display(file) + " line 1: bytes that are not valid " + encoding.name()
                    + "; pass --encoding with the file's encoding, e.g. --encoding ISO-8859-1");
        } catch (FileNotFoundException e) {
            throw new UserError("input " + file.argument() + ": no such file");
        } catch (IOException e) {
            throw new UserError("input " + file.argument() + ": cannot read (" + oneLine(e) + ")");
        }
        if (line == null) {
            throw new UserError("input " + display(file) + ": the file is empty (no header line)");
        }
        if (!line.isEmpty() && line.charAt(0) == '\uFEFF') {
            line = line.substring(1);
        }
        if (line.indexOf('\r') >= 0) { // a CR inside the first line (a trailing one was dropped): CR-only endings
            throw crOnly(file);
        }
        List<String> names;
        try {
            names = CsvFields.split(line, delimiter);
        } catch (CsvFields.Malformed e) {
            throw new UserError("input " + display(file) + " line 1: column " + e.column() + ": "
                    + (e.unterminated() ? "unterminated quote (opened at character " + e.quoteAt() + "); a column"
                    + " name cannot hold a line break" : "text after a closing quote"));
        }
        names.replaceAll(String::trim); // the one whitespace rule, as for values
        for (int i = 0; i < names.size(); i++) {
            if (names.get(i).isBlank()) {
                throw new UserError("input " + display(file) + " line 1: column " + (i + 1) + " has no name");
            }
            for (int j = 0; j < i; j++) {
                if (names.get(j).equals(names.get(i))) {
                    throw new UserError("input " + display(file) + " line 1: duplicate column name '" + names.get(i)
                            + "' (columns " + (j + 1) + " and " + (i + 1) + ")");
                }
                if (names.get(j).equalsIgnoreCase(names.get(i))) {
                    throw new UserError("input " + display(file) + " line 1: column names '" + names.get(j) + "' and '"
                            + names.get(i) + "' (columns " + (j + 1) + " and " + (i + 1) + ") differ only by case;"
                            + " Spark matches names regardless of case, so rename one");
                }
            }
        }
        return names;
    }

    /** The longest header line read: a header names the columns, and a file without line breaks is not read whole. */
    public static final int MAX_HEADER_BYTES = 1 << 20;

    /** A header line longer than {@link #MAX_HEADER_BYTES}. */
    private static final class LongLine extends IOException {
        final boolean carriageReturns;

        LongLine(boolean carriageReturns) {
            super("header line too long");
            this.carriageReturns = carriageReturns;
        }
    }

    /** The refusal of a file whose lines end in a carriage return alone. */
    static UserError crOnly(DataFile file) {
        return new UserError("input " + display(file) + ": lines end in a carriage return alone (CR, old Mac line"
                + " endings); convert them to LF or CRLF, e.g. tr '\\r' '\\n' < in.csv > out.csv");
    }

    /**
     * The next line's bytes up to '\n' (a trailing '\r' dropped) decoded strictly, or null at the end;
     * at most {@link #MAX_HEADER_BYTES} bytes are read ({@link LongLine} beyond).
     */
    private static String nextLine(InputStream in, java.nio.charset.Charset encoding) throws IOException {
        java.io.ByteArrayOutputStream buf = new java.io.ByteArrayOutputStream();
        int b = in.read();
        if (b < 0) {
            return null;
        }
        while (b >= 0 && b != '\n') {
            if (buf.size() >= MAX_HEADER_BYTES) {
                byte[] seen = buf.toByteArray();
                boolean cr = false;
                for (byte x : seen) {
                    cr |= x == '\r';
                }
                throw new LongLine(cr);
            }
            buf.write(b);
            b = in.read();
        }
        byte[] bytes = buf.toByteArray();
        int len = bytes.length > 0 && bytes[bytes.length - 1] == '\r' ? bytes.length - 1 : bytes.length;
        return encoding.newDecoder().onMalformedInput(java.nio.charset.CodingErrorAction.REPORT)
                .onUnmappableCharacter(java.nio.charset.CodingErrorAction.REPORT)
                .decode(java.nio.ByteBuffer.wrap(bytes, 0, len)).toString();
    }

    /**
     * The physical line (1-based) on which data row {@code index} (zero-based, as Spark numbers the
     * rows of this file) starts. Counted as Spark reads: a line that is empty or blank is no row, the
     * first row is the header; with {@code quoted}, a line break inside a quoted field (RFC 4180:
     * a field opening with {@code "}, a doubled quote inside it) continues the row. Every line is
     * counted, blank ones included. Reads the file only up to that row.
     */
    static long physicalLine(DataFile file, long index, boolean quoted, char delimiter, java.nio.charset.Charset encoding,
                             Configuration conf) {
        Path p = new Path(file.uri());
        try {
            FileSystem fs = p.getFileSystem(conf);
            CompressionCodec codec = new CompressionCodecFactory(conf).getCodec(p);
            try (InputStream raw = fs.open(p);
                 BufferedReader in = new BufferedReader(new InputStreamReader(
                         codec == null ? raw : codec.createInputStream(raw), encoding))) {
                long lineNo = 0;
                long row = -2; // the header is row -1
                boolean open = false; // inside a quoted field that continues on the next line
                for (String line = in.readLine(); line != null; line = in.readLine()) {
                    lineNo++;
                    if (!open) {
                        if (line.trim().isEmpty()) {
                            continue;
                        }
                        if (++row == index) {
                            return lineNo;
                        }
                    }
                    if (quoted) {
                        open = stillOpen(line, delimiter, open);
                    }
                }
            }
        } catch (IOException e) {
            throw new UserError("input " + display(file) + ": cannot read (" + oneLine(e) + ")");
        }
        throw new IllegalStateException("row " + index + " of " + file.uri() + " not found again");
    }

    /** Whether a quoted field is still open at the end of {@code line}, given whether one was at its start. */
    static boolean stillOpen(String line, char delimiter, boolean open) {
        boolean fieldStart = !open;
        for (int i = 0; i < line.length(); i++) {
            char c = line.charAt(i);
            if (open) {
                if (c == '"') {
                    if (i + 1 < line.length() && line.charAt(i + 1) == '"') {
                        i++;
                    } else {
                        open = false;
                    }
                }
            } else if (fieldStart && c == '"') {
                open = true;
                fieldStart = false;
            } else {
                fieldStart = c == delimiter;
            }
        }
        return open;
    }

    /** The file as the user would recognise it: the argument itself, or argument/name for a directory. */
    public static String display(DataFile f) {
        String name = new Path(f.uri()).getName();
        return f.argument().endsWith(name) ? f.argument() : f.argument().replaceAll("/+$", "") + "/" + name;
    }

    static String oneLine(Throwable e) {
        String m = e.getMessage() == null ? e.getClass().getSimpleName() : e.getMessage();
        int nl = m.indexOf('\n');
        return nl < 0 ? m : m.substring(0, nl);
    }

    /** Checks that every file has the same columns as the first. */
    public static void sameColumns(List<DataFile> files, List<List<String>> headers) {
        for (int i = 1; i < files.size(); i++) {
            if (!headers.get(i).equals(headers.get(0))) {
                throw new UserError("input " + display(files.get(i)) + ": columns " + headers.get(i)
                        + " differ from those of " + display(files.get(0)) + " " + headers.get(0));
            }
        }
    }

    static String[] uris(List<DataFile> files) {
        return files.stream().map(DataFile::uri).toArray(String[]::new);
    }
}
