package dev.morsel.tokenize.modules;

import static org.junit.jupiter.api.Assertions.assertEquals;

import dev.morsel.tokenize.testkit.ModuleChecks;
import dev.morsel.tokenize.testkit.PackageGraph;
import java.lang.module.ModuleDescriptor;
import java.util.Set;
import java.util.TreeSet;
import java.util.stream.Collectors;
import org.junit.jupiter.api.Test;

/**
 * The compiled module descriptor of {@code tokenize-train} ({@link ModuleChecks}): only the public
 * package is exported, every other compiled package is an {@code internal} one, and the module
 * re-exports only the api it builds on.
 */
class ModuleDescriptorTest {
  private static final Set<String> PUBLIC_PACKAGES = Set.of("dev.morsel.tokenize.train");

  @Test
  void exportsExactlyThePublicPackagesToEveryone() {
    ModuleChecks.assertExportsExactly("dev.morsel.tokenize.train", PUBLIC_PACKAGES);
  }

  @Test
  void everyOtherCompiledPackageIsInternal() {
    ModuleChecks.assertOtherPackagesInternal(PUBLIC_PACKAGES);
  }

  @Test
  void reExportsOnlyTheApi() {
    Set<String> transitive = ModuleChecks.descriptor().requires().stream()
        .filter(r -> r.modifiers().contains(ModuleDescriptor.Requires.Modifier.TRANSITIVE))
        .map(ModuleDescriptor.Requires::name).collect(Collectors.toCollection(TreeSet::new));
    assertEquals(Set.of("dev.morsel.tokenize"), transitive);
  }

  /** No package cycle, and other modules' classes only from the packages they export to this one ({@link PackageGraph}). */
  @Test
  void packagesFormNoCycleAndUseOnlyExportedPackages() {
    PackageGraph g = PackageGraph.ofModuleUnderTest();
    g.assertNoPackageCycles();
    g.assertUsesOnlyExportedPackages("dev.morsel.tokenize.train");
  }
}
