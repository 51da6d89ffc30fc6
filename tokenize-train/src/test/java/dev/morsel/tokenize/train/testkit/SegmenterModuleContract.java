package dev.morsel.tokenize.train.testkit;

import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.testkit.ModuleChecks;
import dev.morsel.tokenize.testkit.PackageGraph;
import dev.morsel.tokenize.train.Learners;
import java.util.Set;
import org.junit.jupiter.api.Test;

/**
 * What every segmenter module's compiled descriptor must show ({@link ModuleChecks}): only its
 * public package is exported, every other compiled package is an {@code internal} one, the segmenter
 * and learner providers are declared with {@code provides … with …} for the module path, the
 * {@code META-INF/services} files name the same providers for the class path, and its packages form
 * no cycle and use other modules only through what those export ({@link PackageGraph}). A segmenter
 * module's test extends this and names its scheme, package and providers.
 */
public abstract class SegmenterModuleContract {
  private final String scheme;
  private final String publicPackage;
  private final String provider;
  private final String learnerProvider;

  /**
   * @param scheme the scheme name, for example {@code "bpe"}
   * @param publicPackage the one exported package, also the module name
   * @param provider the segmenter provider's class name
   * @param learnerProvider the learner provider's class name
   */
  protected SegmenterModuleContract(String scheme, String publicPackage, String provider, String learnerProvider) {
    this.scheme = scheme;
    this.publicPackage = publicPackage;
    this.provider = provider;
    this.learnerProvider = learnerProvider;
  }

  @Test
  void exportsExactlyThePublicPackageToEveryone() {
    ModuleChecks.assertExportsExactly(publicPackage, Set.of(publicPackage));
  }

  @Test
  void everyOtherCompiledPackageIsInternal() {
    ModuleChecks.assertOtherPackagesInternal(Set.of(publicPackage));
  }

  @Test
  void providesTheSegmenterAndItsLearnerOnTheModulePathAndTheClassPathAlike() {
    ModuleChecks.assertProvides(Set.of(provider), Set.of(learnerProvider));
    // on the class path (how these tests run) the loaders find them by scheme name
    assertTrue(Tokenizers.schemes().contains(scheme), "schemes found: " + Tokenizers.schemes());
    assertTrue(Learners.schemes().contains(scheme), "schemes found: " + Learners.schemes());
  }

  @Test
  void packagesFormNoCycleAndUseOnlyExportedPackages() {
    PackageGraph g = PackageGraph.ofModuleUnderTest();
    g.assertNoPackageCycles();
    g.assertUsesOnlyExportedPackages(publicPackage);
  }
}
