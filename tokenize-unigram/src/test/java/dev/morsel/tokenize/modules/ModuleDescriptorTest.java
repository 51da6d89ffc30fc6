package dev.morsel.tokenize.modules;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Tokenizers;
import java.io.IOException;
import java.io.InputStream;
import java.lang.module.ModuleDescriptor;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.Paths;
import java.util.Arrays;
import java.util.Map;
import java.util.Set;
import java.util.TreeMap;
import java.util.TreeSet;
import java.util.stream.Collectors;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;

/**
 * The compiled module descriptor of {@code tokenize-unigram}, read with the JDK's own parser
 * ({@link ModuleDescriptor#read}, the {@code Module} attribute of JVMS 17 §4.7.25): only the
 * public packages are exported, every other compiled package is an {@code internal} one, the
 * segmenter providers are declared with {@code provides … with …} for the module path, and the
 * {@code META-INF/services} file names the same providers for the class path.
 */
class ModuleDescriptorTest {
  private static final Path CLASSES = Paths.get("target/classes");
  private static final String SPI = "dev.morsel.tokenize.spi.SegmenterProvider";

  private static final Set<String> PUBLIC_PACKAGES = Set.of("dev.morsel.tokenize.unigram");
  private static final Set<String> PROVIDERS = Set.of("dev.morsel.tokenize.unigram.internal.UnigramProvider");

  @Test
  void exportsExactlyThePublicPackagesToEveryone() throws IOException {
    ModuleDescriptor d = descriptor();
    assertEquals("dev.morsel.tokenize.unigram", d.name());
    assertFalse(d.isOpen(), "the module must not be open to reflection");
    assertTrue(d.opens().isEmpty(), "no package is opened: " + d.opens());
    Set<String> exported = new TreeSet<>();
    for (ModuleDescriptor.Exports e : d.exports()) {
      assertFalse(e.isQualified(), "qualified export " + e);
      exported.add(e.source());
    }
    assertEquals(new TreeSet<>(PUBLIC_PACKAGES), exported);
  }

  @Test
  void everyOtherCompiledPackageIsInternal() throws IOException {
    Set<String> compiled = compiledPackages();
    assertEquals(compiled, new TreeSet<>(descriptor().packages()), "descriptor packages vs compiled classes");
    Set<String> hidden = new TreeSet<>(compiled);
    hidden.removeAll(PUBLIC_PACKAGES);
    assertFalse(hidden.isEmpty(), "expected implementation packages besides the public ones");
    for (String p : hidden) {
      assertTrue(p.endsWith(".internal"), "unexported package not named internal: " + p);
    }
    assertTrue(compiled.containsAll(PUBLIC_PACKAGES), "public package without classes: " + PUBLIC_PACKAGES);
  }

  @Test
  void providesTheSegmentersOnTheModulePathAndTheClassPathAlike() throws IOException {
    ModuleDescriptor d = descriptor();
    Map<String, Set<String>> provides = new TreeMap<>();
    for (ModuleDescriptor.Provides p : d.provides()) {
      provides.put(p.service(), new TreeSet<>(p.providers()));
    }
    assertEquals(Map.of(SPI, new TreeSet<>(PROVIDERS)), provides);
    assertEquals(Set.of("dev.morsel.tokenize"), d.requires().stream()
        .filter(r -> r.modifiers().contains(ModuleDescriptor.Requires.Modifier.TRANSITIVE))
        .map(ModuleDescriptor.Requires::name).collect(Collectors.toSet()),
        "only the api is re-exported to users");

    Path services = CLASSES.resolve("META-INF/services/" + SPI);
    Set<String> listed = Arrays.stream(Files.readString(services, StandardCharsets.UTF_8).split("\n"))
        .map(String::strip).filter(s -> !s.isEmpty() && !s.startsWith("#"))
        .collect(Collectors.toCollection(TreeSet::new));
    assertEquals(new TreeSet<>(PROVIDERS), listed, services.toString());
    // on the class path (how these tests run) the api's loader finds them by kind
    assertTrue(Tokenizers.kinds().containsAll(Set.of("unigram")), "kinds found: " + Tokenizers.kinds());
  }

  private static ModuleDescriptor descriptor() throws IOException {
    try (InputStream in = Files.newInputStream(CLASSES.resolve("module-info.class"))) {
      return ModuleDescriptor.read(in);
    }
  }

  private static Set<String> compiledPackages() throws IOException {
    try (Stream<Path> files = Files.walk(CLASSES)) {
      return files
          .filter(p -> p.toString().endsWith(".class") && !p.getFileName().toString().equals("module-info.class"))
          .map(p -> CLASSES.relativize(p.getParent()).toString().replace(java.io.File.separatorChar, '.'))
          .collect(Collectors.toCollection(TreeSet::new));
    }
  }
}
