package org.edgewise.job.input;

import java.io.EOFException;
import java.io.IOException;
import java.nio.charset.CharacterCodingException;
import java.util.List;
import java.util.zip.ZipException;
import org.edgewise.driver.UserError;
import org.edgewise.job.input.InputFiles.DataFile;

/**
 * Turns what Spark throws while reading the input into one line naming the file: a truncated or
 * corrupt compressed file, a damaged Parquet page, a Parquet column whose type differs from the
 * first file's, an I/O error. Anything else — our own code failing in a task — stays a bug.
 *
 * <p>Spark wraps a task's failure in a {@code SparkException} (a checked exception thrown
 * undeclared from Scala) whose message names the file being read; the cause chain holds the
 * reader's own exception when it could be sent back from the executor.
 */
public final class ReadFailure {
    private ReadFailure() {
    }

    /** The user-facing error for {@code e} thrown by a Spark action over {@code table}, or {@code e} itself. */
    public static RuntimeException of(Table table, Exception e) {
        String reason = inputReason(e);
        if (reason == null) {
            return e instanceof RuntimeException r ? r : new IllegalStateException(e);
        }
        DataFile f = fileNamed(table.files(), e);
        String which = f != null ? InputFiles.display(f) : TableScan.inputs(table);
        return new UserError("input " + which + ": cannot read it: " + reason, e);
    }

    /** What went wrong, for a failure of the input itself; null for anything else. */
    static String inputReason(Throwable e) {
        String text = chainText(e);
        for (Throwable c = e; c != null; c = c.getCause() == c ? null : c.getCause()) {
            String name = c.getClass().getName();
            String m = c.getMessage() == null ? "" : c.getMessage();
            if (c instanceof EOFException || m.contains("Unexpected end of input stream")) {
                return "the file ends early (truncated or cut off while copying)";
            }
            if (c instanceof ZipException || m.contains("invalid block type") || m.contains("incorrect header check")
                    || m.contains("invalid distance") || m.contains("Not in GZIP format")) {
                return "the compressed data is corrupt";
            }
            if (name.endsWith("SchemaColumnConvertNotSupportedException") || m.contains("cannot be converted in file")
                    || text.contains("[FAILED_READ_FILE.PARQUET_COLUMN_DATA_TYPE_MISMATCH]")) {
                return "a Parquet column has another type than in the first input file; give inputs of one schema";
            }
            if (name.startsWith("org.apache.parquet") || m.contains("is not a Parquet file")) {
                return "the Parquet data is damaged (" + firstLine(m) + ")";
            }
            if (c instanceof CharacterCodingException) {
                return "the text is not in the expected encoding (" + firstLine(m) + ")";
            }
        }
        for (Throwable c = e; c != null; c = c.getCause() == c ? null : c.getCause()) {
            if (c instanceof IOException io) {
                return "I/O error (" + firstLine(io.getMessage() == null ? io.getClass().getSimpleName() : io.getMessage())
                        + ")";
            }
        }
        return null;
    }

    /** The data file whose path appears in a message of the chain (Spark names the file it was reading). */
    static DataFile fileNamed(List<DataFile> files, Throwable e) {
        String text = chainText(e);
        DataFile best = null;
        for (DataFile f : files) {
            String path = new org.apache.hadoop.fs.Path(f.uri()).toUri().getPath();
            if (text.contains(path) && (best == null || path.length() > best.uri().length())) {
                best = f;
            }
        }
        return best != null || files.size() != 1 ? best : files.get(0);
    }

    private static String chainText(Throwable e) {
        StringBuilder sb = new StringBuilder();
        for (Throwable c = e; c != null; c = c.getCause() == c ? null : c.getCause()) {
            sb.append(c.getMessage()).append('\n');
        }
        return sb.toString();
    }

    private static String firstLine(String m) {
        int nl = m.indexOf('\n');
        String s = nl < 0 ? m : m.substring(0, nl);
        return s.length() > 160 ? s.substring(0, 160) + "…" : s;
    }
}
