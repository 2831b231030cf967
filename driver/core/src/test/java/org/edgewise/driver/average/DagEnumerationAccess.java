package org.edgewise.driver.average;

import java.util.List;

/** The DAG enumeration of the average package's tests, for tests in other packages. */
public final class DagEnumerationAccess {
    private DagEnumerationAccess() {
    }

    public static List<int[]> allDags(int n) {
        return DagEnumerationTest.allDags(n);
    }

    public static long linearExtensions(int[] pa, int n) {
        return DagEnumerationTest.linearExtensions(pa, n);
    }

    public static String classKey(int[] pa, int n) {
        return EssentialGraphTest.classKey(pa, n);
    }
}
