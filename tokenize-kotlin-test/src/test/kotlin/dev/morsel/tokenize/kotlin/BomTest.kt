package dev.morsel.tokenize.kotlin

import java.nio.file.Files
import java.nio.file.Paths
import javax.xml.parsers.DocumentBuilderFactory
import org.junit.jupiter.api.Assertions.assertEquals
import org.junit.jupiter.api.Assertions.assertTrue
import org.junit.jupiter.api.Test
import org.w3c.dom.Element

/**
 * The bill of materials (tokenize-bom/pom.xml) stays in step with the build: same group and
 * version as the parent, no parent of its own (so importing it brings in nothing but Morsel's
 * artifacts), and it manages exactly the library artifacts, each at the project version.
 */
class BomTest {
  private fun read(path: String): Element =
      DocumentBuilderFactory.newInstance().newDocumentBuilder().parse(Paths.get(path).toFile()).documentElement

  private fun Element.child(name: String): Element? =
      (0 until childNodes.length).map { childNodes.item(it) }.filterIsInstance<Element>().firstOrNull { it.tagName == name }

  private fun Element.text(name: String): String? = child(name)?.textContent?.trim()

  @Test
  fun bomManagesEveryLibraryArtifactAtTheParentVersion() {
    val parent = read("../pom.xml")
    val bom = read("../tokenize-bom/pom.xml")
    assertEquals(null, bom.child("parent"), "the BOM must not inherit the build's dependency management")
    assertEquals(parent.text("groupId"), bom.text("groupId"))
    assertEquals(parent.text("version"), bom.text("version"))
    assertEquals("pom", bom.text("packaging"))

    val managed = bom.child("dependencyManagement")!!.child("dependencies")!!.getElementsByTagName("dependency")
    val artifacts = (0 until managed.length).map { managed.item(it) as Element }.associate {
      assertEquals("dev.morsel", it.text("groupId"))
      it.text("artifactId")!! to it.text("version")
    }
    assertEquals(setOf("tokenize-api", "tokenize-train", "tokenize-bpe", "tokenize-wordpiece", "tokenize-unigram", "tokenize-spark",
        "tokenize-lucene"), artifacts.keys)
    assertTrue(artifacts.values.all { it == "\${project.version}" }, "versions: $artifacts")
    // every library module of this build is in the BOM
    for (module in listOf("tokenize-api", "tokenize-train", "tokenize-bpe", "tokenize-wordpiece", "tokenize-unigram",
        "tokenize-spark", "tokenize-lucene")) {
      assertTrue(Files.isRegularFile(Paths.get("../$module/pom.xml")), "$module has no pom")
    }
  }
}
