package org.edgewise.job;

import java.util.ArrayList;
import java.util.List;

/**
 * Classic public tables of counts, typed in from R's {@code datasets} package (R Core Team, "The R
 * Datasets Package"), one line per cell with its count — the aggregated form {@code tally --weight}
 * reads — and their expansion to one row per person. Each table's published margins are checked
 * in {@code WeightTest} so a typing slip would show.
 *
 * <p>R's {@code esoph} (Breslow &amp; Day 1980) is not here: its 88 rows were not at hand to type
 * with certainty, and {@code HairEyeColor}, whose every cell and margin was, stands in for it.
 */
final class CountTables {
    private CountTables() {
    }

    /** A table of counts: column names (the count last) and one line per cell. */
    record Counts(List<String> names, List<String[]> lines) {
        /** The sum of the counts. */
        long total() {
            long s = 0;
            for (String[] l : lines) {
                s += Long.parseLong(l[l.length - 1]);
            }
            return s;
        }

        /** One row per unit, the count column left out; rows in an order unlike the lines' (reversed, interleaved). */
        List<String[]> expanded() {
            List<String[]> out = new ArrayList<>();
            for (int i = lines.size() - 1; i >= 0; i--) {
                String[] l = lines.get(i);
                long w = Long.parseLong(l[l.length - 1]);
                for (long k = 0; k < w; k++) {
                    String[] r = java.util.Arrays.copyOf(l, l.length - 1);
                    out.add(r);
                }
            }
            java.util.Collections.shuffle(out, new java.util.Random(1973));
            return out;
        }
    }

    /**
     * R {@code datasets::UCBAdmissions}: applicants to the six largest departments of the graduate
     * school of UC Berkeley, fall 1973, by admission, sex and department (Bickel, Hammel &amp;
     * O'Connell 1975, Science 187:398–404). 4526 applicants, 1755 admitted; 2691 men, 1835 women.
     */
    static Counts ucbAdmissions() {
        String[] dept = {"A", "B", "C", "D", "E", "F"};
        // per department: men admitted, men rejected, women admitted, women rejected
        int[][] n = {{512, 313, 89, 19}, {353, 207, 17, 8}, {120, 205, 202, 391},
            {138, 279, 131, 244}, {53, 138, 94, 299}, {22, 351, 24, 317}};
        List<String[]> lines = new ArrayList<>();
        for (int d = 0; d < dept.length; d++) {
            lines.add(new String[] {"Admitted", "Male", dept[d], Integer.toString(n[d][0])});
            lines.add(new String[] {"Rejected", "Male", dept[d], Integer.toString(n[d][1])});
            lines.add(new String[] {"Admitted", "Female", dept[d], Integer.toString(n[d][2])});
            lines.add(new String[] {"Rejected", "Female", dept[d], Integer.toString(n[d][3])});
        }
        return new Counts(List.of("Admit", "Gender", "Dept", "Freq"), lines);
    }

    /**
     * R {@code datasets::Titanic}: the 2201 people aboard the Titanic by class, sex, age and
     * survival, from the British Board of Trade's 1912 inquiry (Dawson 1995, Journal of Statistics
     * Education 3(3)); 711 survived; 325 first class, 285 second, 706 third, 885 crew. All 32 cells,
     * the 8 empty ones as lines of count 0 (as R's {@code as.data.frame(Titanic)} gives them).
     */
    static Counts titanic() {
        String[] cls = {"1st", "2nd", "3rd", "Crew"};
        // [survived No/Yes][age Child/Adult][sex Male/Female][class]
        int[][][][] n = {
            {{{0, 0, 35, 0}, {0, 0, 17, 0}}, {{118, 154, 387, 670}, {4, 13, 89, 3}}},
            {{{5, 11, 13, 0}, {1, 13, 14, 0}}, {{57, 14, 75, 192}, {140, 80, 76, 20}}}};
        String[] survived = {"No", "Yes"};
        String[] age = {"Child", "Adult"};
        String[] sex = {"Male", "Female"};
        List<String[]> lines = new ArrayList<>();
        for (int s = 0; s < 2; s++) {
            for (int a = 0; a < 2; a++) {
                for (int x = 0; x < 2; x++) {
                    for (int c = 0; c < 4; c++) {
                        lines.add(new String[] {cls[c], sex[x], age[a], survived[s], Integer.toString(n[s][a][x][c])});
                    }
                }
            }
        }
        return new Counts(List.of("Class", "Sex", "Age", "Survived", "Freq"), lines);
    }

    /**
     * R {@code datasets::HairEyeColor}: hair and eye colour and sex of 592 statistics students at
     * the University of Delaware (Snee 1974, The American Statistician 28:9–12); 279 men, 313
     * women; hair Black 108, Brown 286, Red 71, Blond 127; eyes Brown 220, Blue 215, Hazel 93,
     * Green 64.
     */
    static Counts hairEyeColor() {
        String[] hair = {"Black", "Brown", "Red", "Blond"};
        String[] eye = {"Brown", "Blue", "Hazel", "Green"};
        // [sex Male/Female][eye][hair]
        int[][][] n = {
            {{32, 53, 10, 3}, {11, 50, 10, 30}, {10, 25, 7, 5}, {3, 15, 7, 8}},
            {{36, 66, 16, 4}, {9, 34, 7, 64}, {5, 29, 7, 5}, {2, 14, 7, 8}}};
        String[] sex = {"Male", "Female"};
        List<String[]> lines = new ArrayList<>();
        for (int s = 0; s < 2; s++) {
            for (int e = 0; e < 4; e++) {
                for (int h = 0; h < 4; h++) {
                    lines.add(new String[] {hair[h], eye[e], sex[s], Integer.toString(n[s][e][h])});
                }
            }
        }
        return new Counts(List.of("Hair", "Eye", "Sex", "Freq"), lines);
    }
}
