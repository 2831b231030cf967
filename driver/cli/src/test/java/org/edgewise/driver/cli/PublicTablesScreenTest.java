package org.edgewise.driver.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.edgewise.driver.effect.PublicTablesTest;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.StoreWriter;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class PublicTablesScreenTest {
    @TempDir
    static Path dir;

    static Path write(String name, ScoreStore s) {
        Path p = dir.resolve(name);
        if (!Files.exists(p)) {
            StoreWriter.write(p, s.manifest(), s.families(), s.logScores(), false);
        }
        return p;
    }

    static void run(String name, ScoreStore s, String tiers, String... effect) throws Exception {
        Path store = write(name, s);
        String tag = name + (tiers == null ? "-open" : "-tiers");
        List<String> e = new ArrayList<>(List.of("edges", "--store", store.toString(), "--method", "exact", "--features", "essential-graph",
                "--out", dir.resolve(tag + "-edges.json").toString()));
        if (tiers != null) {
            e.addAll(List.of("--tiers", tiers));
        }
        CliRun er = CliRun.of(e.toArray(String[]::new));
        assertEquals(0, er.status(), er.err());
        List<String> f = new ArrayList<>(List.of("effect", "--store", store.toString(), "--method", "exact", "--effect-draws", "400",
                "--out", dir.resolve(tag + "-effect.json").toString(), "--format", "table"));
        f.addAll(List.of(effect));
        if (tiers != null) {
            f.addAll(List.of("--tiers", tiers));
        }
        CliRun fr = CliRun.of(f.toArray(String[]::new));
        assertEquals(0, fr.status(), fr.err());
        CliRun rr = CliRun.of("report", "--result", dir.resolve(tag + "-edges.json").toString(), "--effect",
                dir.resolve(tag + "-effect.json").toString(), "--out", dir.resolve(tag + ".html").toString());
        assertEquals(0, rr.status(), rr.err());
        Path o = Path.of("target", "public-tables");
        Files.createDirectories(o);
        Files.writeString(o.resolve(tag + "-effect.txt"), fr.out() + "\n---\n" + fr.err());
        Files.copy(dir.resolve(tag + ".html"), o.resolve(tag + ".html"), java.nio.file.StandardCopyOption.REPLACE_EXISTING);
        Files.copy(dir.resolve(tag + "-edges.json"), o.resolve(tag + "-edges.json"), java.nio.file.StandardCopyOption.REPLACE_EXISTING);
        Files.copy(dir.resolve(tag + "-effect.json"), o.resolve(tag + "-effect.json"), java.nio.file.StandardCopyOption.REPLACE_EXISTING);
    }

    @Test
    void explore() throws Exception {
        String[] ucb = {"--do", "Gender=Female", "--versus", "Gender=Male", "--target", "Admit=Admitted"};
        run("ucb", PublicTablesTest.ucbStore(), null, ucb);
        run("ucb", PublicTablesTest.ucbStore(), "Gender;Dept;Admit", ucb);
        String[] tit = {"--do", "Class=1st", "--versus", "Class=3rd", "--target", "Survived=Yes"};
        run("titanic", PublicTablesTest.titanicStore(), null, tit);
        run("titanic", PublicTablesTest.titanicStore(), "Sex,Age;Class;Survived", tit);
        String[] eso = {"--do", "alcgp=120+", "--versus", "alcgp=0-39", "--target", "status=case", "--design", "case-control", "--outcome", "status"};
        run("esoph", PublicTablesTest.esophStore(), null, eso);
        run("esoph", PublicTablesTest.esophStore(), "agegp;alcgp,tobgp;status", eso);
    }
}
