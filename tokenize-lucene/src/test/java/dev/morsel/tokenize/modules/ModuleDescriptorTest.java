package dev.morsel.tokenize.modules;

import static org.junit.jupiter.api.Assertions.assertEquals;

import dev.morsel.tokenize.testkit.ModuleChecks;
import dev.morsel.tokenize.testkit.PackageGraph;
import java.lang.module.ModuleDescriptor;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Paths;
import java.util.Map;
import java.util.Set;
import java.util.TreeMap;
import java.util.TreeSet;
import java.util.stream.Collectors;
import org.junit.jupiter.api.Test;

/** The compiled descriptor of tokenize-lucene: what it exports, re-exports and provides. */
class ModuleDescriptorTest {
  private static final String FACTORY_SPI = "org.apache.lucene.analysis.TokenizerFactory";
  private static final String FACTORY = "dev.morsel.tokenize.lucene.SubwordTokenizerFactory";

  @Test
  void exportsTheOnePackage() {
    ModuleChecks.assertExportsExactly("dev.morsel.tokenize.lucene", Set.of("dev.morsel.tokenize.lucene"));
    ModuleChecks.assertOtherPackagesInternal(Set.of("dev.morsel.tokenize.lucene"));
  }

  @Test
  void reExportsTheApiAndLuceneCoreWhoseTypesItsApiShows() {
    ModuleDescriptor d = ModuleChecks.descriptor();
    assertEquals(Set.of("dev.morsel.tokenize", "org.apache.lucene.core"), d.requires().stream()
        .filter(r -> r.modifiers().contains(ModuleDescriptor.Requires.Modifier.TRANSITIVE))
        .map(ModuleDescriptor.Requires::name).collect(Collectors.toSet()));
  }

  @Test
  void providesTheTokenizerFactoryOnTheModulePathAndTheClassPath() throws Exception {
    Map<String, Set<String>> provides = new TreeMap<>();
    for (ModuleDescriptor.Provides p : ModuleChecks.descriptor().provides()) {
      provides.put(p.service(), new TreeSet<>(p.providers()));
    }
    assertEquals(Map.of(FACTORY_SPI, Set.of(FACTORY)), provides);
    String listed = Files.readString(Paths.get("target/classes/META-INF/services/" + FACTORY_SPI), StandardCharsets.UTF_8);
    assertEquals(FACTORY, listed.strip());
  }

  /** No package cycle, and other modules' classes only from the packages they export to this one ({@link PackageGraph}). */
  @Test
  void packagesFormNoCycleAndUseOnlyExportedPackages() {
    PackageGraph g = PackageGraph.ofModuleUnderTest();
    g.assertNoPackageCycles();
    g.assertUsesOnlyExportedPackages("dev.morsel.tokenize.lucene");
  }
}
