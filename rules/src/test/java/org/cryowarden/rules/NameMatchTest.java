package org.cryowarden.rules;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.List;
import org.junit.jupiter.api.Test;

class NameMatchTest {

    @Test
    void editDistanceIsLevenshteinForWordsWithoutSwaps() {
        // kitten -> sitting: 3 edits (V. I. Levenshtein's measure; the textbook example, from memory)
        assertThat(NameMatch.editDistance("kitten", "sitting")).isEqualTo(3);
        assertThat(NameMatch.editDistance("", "abc")).isEqualTo(3);
        assertThat(NameMatch.editDistance("same", "same")).isZero();
    }

    @Test
    void adjacentSwapCostsOneEditButNoSubstringIsEditedTwice() {
        // optimal string alignment: "ca" -> "ac" is one transposition; "ca" -> "abc" is 3, not the 2 of the
        // unrestricted Damerau-Levenshtein distance (F. J. Damerau, CACM 7 (1964) 171; the OSA restriction
        // as usually stated, from memory)
        assertThat(NameMatch.editDistance("ca", "ac")).isEqualTo(1);
        assertThat(NameMatch.editDistance("ca", "abc")).isEqualTo(3);
    }

    @Test
    void closestIgnoresCaseAndKeepsTheCandidatesSpelling() {
        assertThat(NameMatch.closest("BAUD", List.of("parity", "baud"))).contains("baud");
        assertThat(NameMatch.closest("timout", List.of("Timeout"))).contains("Timeout");
    }

    @Test
    void closestAllowsTwoEditsOrAThirdOfTheWordWhicheverIsMore() {
        // common practice for typo hints; the measure the whole program shares
        assertThat(NameMatch.closest("hots", List.of("host"))).contains("host");
        assertThat(NameMatch.closest("abc", List.of("axy"))).contains("axy");
        assertThat(NameMatch.closest("abc", List.of("xyz"))).isEmpty();
        assertThat(NameMatch.closest("temperature", List.of("tempxxxture"))).contains("tempxxxture");
        assertThat(NameMatch.closest("temperature", List.of("txxxxrature"))).isEmpty();
    }

    @Test
    void closestNeverSuggestsANameAsFarAsTheWordIsLong() {
        assertThat(NameMatch.closest("a", List.of("b"))).isEmpty();
        assertThat(NameMatch.closest("ab", List.of("xy"))).isEmpty();
        assertThat(NameMatch.closest("ab", List.of("xb"))).contains("xb");
    }

    @Test
    void tiesGoToTheEarlierCandidate() {
        assertThat(NameMatch.closest("bat", List.of("bad", "bag"))).contains("bad");
        assertThat(NameMatch.closest("bat", List.of("bag", "bad"))).contains("bag");
        assertThat(NameMatch.closest("anything", List.of())).isEmpty();
    }
}
