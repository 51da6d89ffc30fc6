package dev.morsel.tokenize.bench;

import dev.morsel.tokenize.testkit.PackageGraph;
import org.junit.jupiter.api.Test;

/**
 * {@code tokenize-bench} has no module descriptor, but keeps the rules of the library modules
 * ({@link PackageGraph}): no package cycle, and the library modules' classes only from the packages
 * they export to everyone.
 */
class PackageRulesTest {
  @Test
  void packagesFormNoCycleAndUseOnlyExportedPackages() {
    PackageGraph g = PackageGraph.ofModuleUnderTest();
    g.assertNoPackageCycles();
    g.assertUsesOnlyExportedPackages(null);
  }
}
