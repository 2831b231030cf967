package org.edgewise.driver.store;

import com.fasterxml.jackson.annotation.JsonIgnore;
import com.fasterxml.jackson.annotation.JsonInclude;
import java.util.List;
import java.util.Map;

/**
 * {@code manifest.json} of a score store — the contract between the tally job and the driver.
 *
 * @param formatVersion   {@link StoreFormat#VERSION} once written: {@link StoreWriter} stamps it; 0 for a
 *                        manifest built in memory by {@link #of} and not yet written
 * @param variables       every variable, in store order (variable index = position)
 * @param maxParents      the in-degree bound d
 * @param candidates      per child name, its candidate parents when pruned ({@code --candidates K});
 *                        null when every other variable is a candidate
 * @param forbidden       edges forbidden at tally time
 * @param required        edges required at tally time
 * @param tiers           tiers (no parent from a later tier); empty when none
 * @param score           score kind of the stored log scores ({@code bdeu} or {@code k2})
 * @param ess             equivalent sample size of the stored scores (BDeu)
 * @param parts           the Parquet parts; filled in by the writer (null until written)
 * @param missingValues   how missing cells were averaged over (data augmentation; format version 2),
 *                        or null when the table had none or they were dropped or made a state
 * @param reserve         per child name, the further candidates (best first, by the same single-parent
 *                        gain as {@code candidates}) whose families the store also holds, so that the
 *                        driver can widen a child's candidate set into them without a new tally; null
 *                        when the tally kept no reserve. Older readers ignore it (no format-version change:
 *                        such a reader averages over every stored family, the wider set, which is still
 *                        a pruned posterior of the same data)
 */
@JsonInclude(JsonInclude.Include.NON_NULL)
public record Manifest(int formatVersion, String program, String programVersion, String createdAt,
                       InputInfo input, List<Variable> variables, int maxParents,
                       Map<String, List<String>> candidates, List<EdgeRule> forbidden,
                       List<EdgeRule> required, List<List<String>> tiers, String score, double ess,
                       StoreParts parts, MissingValues missingValues, Map<String, List<String>> reserve) {

    /**
     * A manifest for a store about to be written or held in memory: the writer fills in the
     * format version and the parts.
     */
    public static Manifest of(String program, String programVersion, String createdAt, InputInfo input,
                              List<Variable> variables, int maxParents, Map<String, List<String>> candidates,
                              List<EdgeRule> forbidden, List<EdgeRule> required, List<List<String>> tiers,
                              String score, double ess) {
        return new Manifest(0, program, programVersion, createdAt, input, variables, maxParents, candidates,
                forbidden, required, tiers, score, ess, null, null, null);
    }

    /** This manifest with {@code mv} recorded (a store averaged over missing values). */
    public Manifest withMissingValues(MissingValues mv) {
        return new Manifest(formatVersion, program, programVersion, createdAt, input, variables, maxParents, candidates,
                forbidden, required, tiers, score, ess, parts, mv, reserve);
    }

    /** The same manifest with {@code reserve} (see the record's description) in place of its own. */
    public Manifest withReserve(Map<String, List<String>> reserve) {
        return new Manifest(formatVersion, program, programVersion, createdAt, input, variables, maxParents, candidates,
                forbidden, required, tiers, score, ess, parts, missingValues, reserve);
    }

    /** Index of a variable by name, or −1. */
    public int variableIndex(String name) {
        for (int i = 0; i < variables.size(); i++) {
            if (variables.get(i).name().equals(name)) {
                return i;
            }
        }
        return -1;
    }

    @JsonIgnore
    public int variableCount() {
        return variables.size();
    }
}
