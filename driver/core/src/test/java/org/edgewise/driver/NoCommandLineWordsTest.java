package org.edgewise.driver;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayInputStream;
import java.io.DataInputStream;
import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.TreeMap;
import java.util.regex.Pattern;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;

/**
 * The core library knows nothing of the command line (DEVELOPERS.md, "Layers"): no string constant
 * of a compiled core class names a command-line option ({@code --order}, {@code --overwrite} …) or
 * the launcher's environment ({@code EDGEWISE_JAVA_OPTS}). Messages name inputs as the caller names
 * them ({@link Checks}' {@code what}, {@link InputNames}). Nothing is allow-listed.
 *
 * <p>The check reads the constant pool of every class file (JVM Specification SE 17, §4.4): the
 * {@code CONSTANT_String} entries are exactly the string literals and folded constants of the
 * source, including the recipes of {@code +} concatenations (JEP 280), and not the comments — so
 * Javadoc may still show how the CLI spells an input.
 */
class NoCommandLineWordsTest {
    /** An option as the CLI spells it, anywhere in a literal; or the launcher's variables. */
    static final Pattern CLI_WORDS = Pattern.compile("--[a-z]|EDGEWISE_[A-Z]+_OPTS");

    @Test
    void noCoreClassSpellsACommandLineOption() throws Exception {
        Path classes = Path.of(UserError.class.getProtectionDomain().getCodeSource().getLocation().toURI());
        assertTrue(Files.isRegularFile(classes.resolve("org/edgewise/driver/UserError.class")),
                "expected the core's main classes at " + classes);
        TreeMap<String, List<String>> found = new TreeMap<>();
        int scanned = 0;
        try (Stream<Path> files = Files.walk(classes)) {
            for (Path f : (Iterable<Path>) files.filter(p -> p.toString().endsWith(".class"))::iterator) {
                scanned++;
                for (String s : stringConstants(Files.readAllBytes(f))) {
                    if (CLI_WORDS.matcher(s).find()) {
                        found.computeIfAbsent(classes.relativize(f).toString(), k -> new ArrayList<>()).add(s);
                    }
                }
            }
        }
        assertTrue(scanned > 100, "scanned only " + scanned + " classes under " + classes);
        assertEquals(new TreeMap<>(), found, "core classes whose string constants name a command-line option; "
                + "take the name from the caller (a what argument, InputNames) instead");
    }

    /** The scanner finds a literal naming an option, also inside a concatenation, and nothing in a comment. */
    @Test
    void theScannerSeesLiteralsAndConcatenations() throws Exception {
        byte[] bytes;
        try (InputStream in = Sample.class.getResourceAsStream("NoCommandLineWordsTest$Sample.class")) {
            bytes = in.readAllBytes();
        }
        List<String> hits = stringConstants(bytes).stream().filter(s -> CLI_WORDS.matcher(s).find()).sorted().toList();
        assertEquals(List.of("\u0001 contradicts --tiers", "--order: empty", "raise EDGEWISE_JAVA_OPTS"), hits);
    }

    /** Literals for the scanner's own check; the comment's {@code --given} must not count. */
    static final class Sample {
        String plain() {
            return "--order: empty";
        }

        String concatenated(Object e) {
            return e + " contradicts --tiers";
        }

        String environment() {
            return "raise EDGEWISE_JAVA_OPTS";
        }
    }

    /** The {@code CONSTANT_String} values of a class file (JVMS §4.1, §4.4). */
    static List<String> stringConstants(byte[] classFile) throws IOException {
        DataInputStream in = new DataInputStream(new ByteArrayInputStream(classFile));
        if (in.readInt() != 0xCAFEBABE) {
            throw new IOException("not a class file");
        }
        in.readUnsignedShort(); // minor
        in.readUnsignedShort(); // major
        int count = in.readUnsignedShort();
        String[] utf8 = new String[count];
        List<Integer> strings = new ArrayList<>();
        for (int i = 1; i < count; i++) {
            int tag = in.readUnsignedByte();
            switch (tag) {
                case 1 -> utf8[i] = in.readUTF(); // modified UTF-8 with its u2 length, as DataInput reads it
                case 8 -> strings.add(in.readUnsignedShort());
                case 7, 16, 19, 20 -> in.readUnsignedShort();
                case 15 -> in.skipBytes(3);
                case 3, 4, 9, 10, 11, 12, 17, 18 -> in.skipBytes(4);
                case 5, 6 -> {
                    in.skipBytes(8);
                    i++; // a long or double takes two entries
                }
                default -> throw new IOException("unknown constant-pool tag " + tag + " at entry " + i);
            }
        }
        List<String> out = new ArrayList<>();
        for (int s : strings) {
            out.add(utf8[s]);
        }
        return out;
    }
}
