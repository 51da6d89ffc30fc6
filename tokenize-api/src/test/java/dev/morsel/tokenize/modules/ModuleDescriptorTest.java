package dev.morsel.tokenize.modules;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.InputStream;
import java.lang.module.ModuleDescriptor;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.Paths;
import java.util.Set;
import java.util.TreeSet;
import java.util.stream.Collectors;
import java.util.stream.Stream;
import dev.morsel.tokenize.testkit.ModuleChecks;
import org.junit.jupiter.api.Test;

/**
 * The compiled module descriptor of {@code tokenize-api}, read with the JDK's own parser
 * ({@link ModuleDescriptor#read}, the {@code Module} attribute of JVMS 17 §4.7.25): the module
 * exports exactly its public API packages, none of them only to friends, and uses the segmenter SPI.
 * The compiled classes are listed too, so a new package cannot slip in unexported or exported by
 * accident.
 */
class ModuleDescriptorTest {
  private static final Path CLASSES = Paths.get("target/classes");

  private static final Set<String> API_PACKAGES = Set.of(
      "dev.morsel.tokenize",
      "dev.morsel.tokenize.normalize",
      "dev.morsel.tokenize.split",
      "dev.morsel.tokenize.format",
      "dev.morsel.tokenize.spi");

  /** The helpers the segmenter modules share, exported to them alone. */
  private static final String SHARED = "dev.morsel.tokenize.internal";
  private static final Set<String> SEGMENTER_MODULES = Set.of(
      "dev.morsel.tokenize.bpe", "dev.morsel.tokenize.wordpiece", "dev.morsel.tokenize.unigram");

  @Test
  void exportsTheApiPackagesToEveryoneAndTheSharedHelpersToTheSegmentersOnly() {
    ModuleDescriptor d = ModuleChecks.descriptor();
    assertEquals("dev.morsel.tokenize", d.name());
    assertFalse(d.isOpen());
    assertTrue(d.opens().isEmpty(), "no package is opened: " + d.opens());
    Set<String> everyone = new TreeSet<>();
    for (ModuleDescriptor.Exports e : d.exports()) {
      if (e.isQualified()) {
        assertEquals(SHARED, e.source(), "the only qualified export");
        assertEquals(SEGMENTER_MODULES, e.targets());
      } else {
        everyone.add(e.source());
      }
    }
    assertEquals(new TreeSet<>(API_PACKAGES), everyone);
  }

  @Test
  void everyCompiledPackageIsExported() {
    Set<String> all = new TreeSet<>(API_PACKAGES);
    all.add(SHARED);
    assertEquals(all, ModuleChecks.compiledPackages());
    assertEquals(ModuleChecks.compiledPackages(), new TreeSet<>(ModuleChecks.descriptor().packages()));
  }

  @Test
  void usesTheSegmenterSpiAndRequiresOnlyItsTwoLibraries() {
    ModuleDescriptor d = ModuleChecks.descriptor();
    assertEquals(Set.of("dev.morsel.tokenize.spi.SegmenterProvider"), d.uses());
    assertTrue(d.provides().isEmpty(), "the api provides no segmenter: " + d.provides());
    Set<String> required = d.requires().stream()
        .filter(r -> !r.name().equals("java.base"))
        .map(ModuleDescriptor.Requires::name)
        .collect(Collectors.toCollection(TreeSet::new));
    assertEquals(new TreeSet<>(Set.of("com.ibm.icu", "it.unimi.dsi.fastutil.core")), required);
  }
}
