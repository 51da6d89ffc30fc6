package dev.morsel.tokenize.modules;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.testkit.PackageGraph;
import java.io.IOException;
import java.io.InputStream;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.junit.jupiter.api.Test;

/**
 * The package-graph checks themselves: they find a planted cycle, and the class-file reader finds the
 * classes a known class uses; then the api's own packages pass both checks.
 */
class PackageGraphTest {
  @Test
  void findsPlantedCyclesAndOnlyThem() {
    PackageGraph g = PackageGraph.ofEdges(Map.of(
        "a", Set.of("b"), "b", Set.of("c"), "c", Set.of("a", "d"), "d", Set.of(), "e", Set.of("e", "d")));
    assertEquals(List.of(Set.of("a", "b", "c")), g.cycles());
    assertThrows(AssertionError.class, g::assertNoPackageCycles);
    PackageGraph.ofEdges(Map.of("a", Set.of("b"), "b", Set.of("c"), "c", Set.of())).assertNoPackageCycles();
  }

  /** Reads this very class's file: JUnit and the test kit appear, through calls and descriptors. */
  @Test
  void readsTheClassesAClassFileUses() throws IOException {
    byte[] bytes;
    try (InputStream in = PackageGraphTest.class.getResourceAsStream("PackageGraphTest.class")) {
      bytes = in.readAllBytes();
    }
    Set<String> used = PackageGraph.referencedClasses(bytes);
    assertTrue(used.contains("dev.morsel.tokenize.testkit.PackageGraph"), used.toString());
    assertTrue(used.contains("org.junit.jupiter.api.Assertions"), used.toString());
    assertTrue(used.contains("java.io.InputStream"), "from a local variable's method call: " + used);
  }

  @Test
  void theApiHasNoPackageCycleAndUsesNoHiddenPackage() {
    PackageGraph g = PackageGraph.ofModuleUnderTest();
    assertTrue(g.packages().contains("dev.morsel.tokenize.spi"), g.packages().toString());
    g.assertNoPackageCycles();
    g.assertUsesOnlyExportedPackages("dev.morsel.tokenize");
  }
}
