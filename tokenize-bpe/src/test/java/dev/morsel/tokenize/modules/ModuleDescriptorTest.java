package dev.morsel.tokenize.modules;

import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.testkit.ModuleChecks;
import dev.morsel.tokenize.testkit.PackageGraph;
import dev.morsel.tokenize.train.Learners;
import java.util.Set;
import org.junit.jupiter.api.Test;

/**
 * The compiled module descriptor of {@code tokenize-bpe} ({@link ModuleChecks}): only the public
 * packages are exported, every other compiled package is an {@code internal} one, the segmenter
 * and learner providers are declared with {@code provides … with …} for the module path, and the
 * {@code META-INF/services} files name the same providers for the class path.
 */
class ModuleDescriptorTest {
  private static final Set<String> PUBLIC_PACKAGES = Set.of("dev.morsel.tokenize.bpe");
  private static final Set<String> PROVIDERS = Set.of("dev.morsel.tokenize.bpe.internal.BpeProvider");
  private static final Set<String> LEARNERS = Set.of("dev.morsel.tokenize.bpe.internal.BpeLearnerProvider");

  @Test
  void exportsExactlyThePublicPackagesToEveryone() {
    ModuleChecks.assertExportsExactly("dev.morsel.tokenize.bpe", PUBLIC_PACKAGES);
  }

  @Test
  void everyOtherCompiledPackageIsInternal() {
    ModuleChecks.assertOtherPackagesInternal(PUBLIC_PACKAGES);
  }

  @Test
  void providesTheSegmenterAndItsLearnerOnTheModulePathAndTheClassPathAlike() {
    ModuleChecks.assertProvides(PROVIDERS, LEARNERS);
    // on the class path (how these tests run) the api's loader finds them by kind
    assertTrue(Tokenizers.schemes().containsAll(Set.of("bpe")), "schemes found: " + Tokenizers.schemes());
    assertTrue(Learners.schemes().contains("bpe"), "schemes found: " + Learners.schemes());
  }

  /** No package cycle, and other modules' classes only from the packages they export to this one ({@link PackageGraph}). */
  @Test
  void packagesFormNoCycleAndUseOnlyExportedPackages() {
    PackageGraph g = PackageGraph.ofModuleUnderTest();
    g.assertNoPackageCycles();
    g.assertUsesOnlyExportedPackages("dev.morsel.tokenize.bpe");
  }
}
