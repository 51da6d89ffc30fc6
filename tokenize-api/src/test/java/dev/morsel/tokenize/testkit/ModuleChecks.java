package dev.morsel.tokenize.testkit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
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

/**
 * Checks of a module's compiled descriptor ({@code target/classes/module-info.class}, read with the
 * JDK's own parser {@link ModuleDescriptor#read}, the {@code Module} attribute of JVMS 17 §4.7.25),
 * shared by every library module's {@code ModuleDescriptorTest}.
 */
public final class ModuleChecks {
  /** The segmenter SPI. */
  public static final String SPI = "dev.morsel.tokenize.spi.SegmenterProvider";
  /** The learner SPI. */
  public static final String LEARNER_SPI = "dev.morsel.tokenize.train.LearnerProvider";

  private static final Path CLASSES = Paths.get("target/classes");

  private ModuleChecks() {}

  /** The module descriptor of the module under test. */
  public static ModuleDescriptor descriptor() {
    try (InputStream in = Files.newInputStream(CLASSES.resolve("module-info.class"))) {
      return ModuleDescriptor.read(in);
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
  }

  /** The packages that hold compiled classes. */
  public static Set<String> compiledPackages() {
    try (Stream<Path> files = Files.walk(CLASSES)) {
      return files
          .filter(p -> p.toString().endsWith(".class") && !p.getFileName().toString().equals("module-info.class"))
          .map(p -> CLASSES.relativize(p.getParent()).toString().replace(java.io.File.separatorChar, '.'))
          .collect(Collectors.toCollection(TreeSet::new));
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
  }

  /** The module is named {@code name}, is not open, opens nothing, and exports exactly {@code exported} to everyone. */
  public static void assertExportsExactly(String name, Set<String> exported) {
    ModuleDescriptor d = descriptor();
    assertEquals(name, d.name());
    assertFalse(d.isOpen(), "the module must not be open to reflection");
    assertTrue(d.opens().isEmpty(), "no package is opened: " + d.opens());
    Set<String> found = new TreeSet<>();
    for (ModuleDescriptor.Exports e : d.exports()) {
      assertFalse(e.isQualified(), "qualified export " + e);
      found.add(e.source());
    }
    assertEquals(new TreeSet<>(exported), found);
  }

  /** Every compiled package is in the descriptor, and every one not exported is named {@code ….internal}. */
  public static void assertOtherPackagesInternal(Set<String> exported) {
    Set<String> compiled = compiledPackages();
    assertEquals(compiled, new TreeSet<>(descriptor().packages()), "descriptor packages vs compiled classes");
    assertTrue(compiled.containsAll(exported), "public package without classes: " + exported);
    Set<String> hidden = new TreeSet<>(compiled);
    hidden.removeAll(exported);
    for (String p : hidden) {
      assertTrue(p.endsWith(".internal"), "unexported package not named internal: " + p);
    }
  }

  /**
   * The module {@code provides} the segmenter SPI with exactly {@code segmenters} and the learner SPI
   * with exactly {@code learners} (either may be empty), re-exports only the api and the training
   * module, and its {@code META-INF/services} files (for the class path) name the same providers.
   */
  public static void assertProvides(Set<String> segmenters, Set<String> learners) {
    ModuleDescriptor d = descriptor();
    Map<String, Set<String>> provides = new TreeMap<>();
    for (ModuleDescriptor.Provides p : d.provides()) {
      provides.put(p.service(), new TreeSet<>(p.providers()));
    }
    Map<String, Set<String>> want = new TreeMap<>();
    if (!segmenters.isEmpty()) {
      want.put(SPI, new TreeSet<>(segmenters));
    }
    if (!learners.isEmpty()) {
      want.put(LEARNER_SPI, new TreeSet<>(learners));
    }
    assertEquals(want, provides);
    assertTrue(Set.of("dev.morsel.tokenize", "dev.morsel.tokenize.train").containsAll(d.requires().stream()
        .filter(r -> r.modifiers().contains(ModuleDescriptor.Requires.Modifier.TRANSITIVE))
        .map(ModuleDescriptor.Requires::name).collect(Collectors.toSet())),
        "only the api and the training module are re-exported to users: " + d.requires());
    for (Map.Entry<String, Set<String>> e : want.entrySet()) {
      assertEquals(e.getValue(), servicesFile(e.getKey()), "META-INF/services/" + e.getKey());
    }
  }

  /** The providers a {@code META-INF/services} file of the module under test names (empty if none). */
  public static Set<String> servicesFile(String service) {
    Path services = CLASSES.resolve("META-INF/services/" + service);
    if (!Files.isRegularFile(services)) {
      return Set.of();
    }
    try {
      return Arrays.stream(Files.readString(services, StandardCharsets.UTF_8).split("\n"))
          .map(String::strip).filter(s -> !s.isEmpty() && !s.startsWith("#"))
          .collect(Collectors.toCollection(TreeSet::new));
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
  }
}
