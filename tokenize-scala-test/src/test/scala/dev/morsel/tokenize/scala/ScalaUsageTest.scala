package dev.morsel.tokenize.scala

import dev.morsel.tokenize.{Decoding, Pipeline, Side, Tokenizers, Tokens, Trust}
import dev.morsel.tokenize.bpe.BpeLearner
import dev.morsel.tokenize.train.PieceCounter
import java.nio.charset.StandardCharsets
import java.nio.file.{Files, Paths}
import java.text.Normalizer
import org.junit.jupiter.api.Assertions.{assertEquals, assertFalse, assertTrue}
import org.junit.jupiter.api.Test
import scala.jdk.CollectionConverters._

/**
 * Morsel from Scala 2.13, written the way a Scala batch job or notebook would use it: Scala
 * collections converted at the boundary with `asJava` / `asScala`, ranges over token indices, no
 * exception handling forced by the API. The region between the markers is shown in docs/guide.md;
 * the last test checks the guide still holds every line of it.
 */
class ScalaUsageTest {

  /** Our own invented passenger messages for a fictional regional ferry operator. */
  private val messages = Seq(
    "Is the 18:05 sailing to Skarvøy full tonight?",
    "My bicycle ticket for the Skarvøy ferry was charged twice.",
    "Can I bring a kayak on the morning ferry to Tarnholm?",
    "The ferry to Tarnholm left without the cars from lane three.",
    "Is there a café on board the evening sailing?",
    "Which pier does the Skarvøy ferry leave from on Sundays?",
    "My dog and I missed the 07:40 sailing; can we take the next ferry?",
    "Will the sailing to Tarnholm run if the wind is this strong?",
    "The ticket machine at the pier only takes cards.",
    "Cabin 12 on the night ferry has no blankets."
  )

  @Test
  def trainEncodePadAndDecodeTheScalaWay(): Unit = {
    // @start region="scala"
    val pipeline = Pipeline.defaults()
    val counts = PieceCounter.builder().pipeline(pipeline).build().count(messages.asJava)
    val tokenizer = BpeLearner.builder()
      .vocabularySize(400)
      .reservedTokens(Seq("⟦slack⟧", "⟦crew⟧").asJava)
      .build()
      .train(counts) // a tokenizer bound to the counted pipeline

    val text = "Is the 18:05 sailing to Skarvøy full?"
    val tokens = tokenizer.encode(text)
    val pieces = (0 until tokens.size()).map(i => text.substring(tokens.start(i), tokens.end(i)))

    val slack = tokenizer.reservedTokens().id("⟦slack⟧")
    val encoded = tokenizer.encodeAll(Seq(text, "Cabin 12?").asJava)
    val batch = Tokens.padBatch(encoded, slack, Side.END).asScala.toSeq
    val masks = batch.map(_.nonPaddingMask())

    val back = tokenizer.decode(tokens.ids())
    // @end region="scala"

    // java.text.Normalizer is the independent reference for what the default pipeline (NFC) keeps
    assertEquals(Normalizer.normalize(text, Normalizer.Form.NFC), back)
    assertEquals(text, back)
    for (i <- 1 until tokens.size()) {
      assertTrue(tokens.start(i) >= tokens.end(i - 1), s"span $i overlaps span ${i - 1}")
    }
    assertEquals(text, pieces.mkString)
    assertTrue(tokens.size() < text.length, s"training merged nothing: ${tokens.size()} tokens")

    assertEquals(2, batch.size)
    assertEquals(batch(0).size(), batch(1).size())
    assertEquals(tokens, batch(0))
    val short = batch(1)
    val shortLength = tokenizer.encode("Cabin 12?").size()
    for (i <- 0 until short.size()) {
      assertEquals(i >= shortLength, short.isPadding(i), s"padding flag at $i")
      assertEquals(if (i >= shortLength) 0 else 1, masks(1)(i), s"mask at $i")
    }
    assertEquals("Cabin 12?", tokenizer.decode(short.ids(), true, Decoding.REPLACE))
  }

  @Test
  def reservedSpellingsInUntrustedTextStayText(): Unit = {
    val tokenizer = BpeLearner.builder().vocabularySize(300).reservedTokens(Seq("⟦slack⟧", "⟦crew⟧").asJava).build()
      .train(PieceCounter.builder().build().count(messages.asJava))
    val typed = "please page ⟦crew⟧ now"
    val untrusted = tokenizer.encode(typed)
    assertFalse((0 until untrusted.size()).exists(untrusted.isReserved), "a passenger injected a reserved token")
    val trusted = tokenizer.encode(typed, Trust.TRUSTED)
    val crew = tokenizer.reservedTokens().id("⟦crew⟧")
    assertEquals(Seq(crew), (0 until trusted.size()).filter(trusted.isReserved).map(trusted.id))
    // Java returns null for "no such reserved id": wrap it in Option at the boundary
    assertEquals(None, Option(tokenizer.reservedTokens().spelling(9999)))
  }

  @Test
  def guideShowsTheScalaRegion(): Unit = {
    val source = new String(Files.readAllBytes(
      Paths.get("src/test/scala/dev/morsel/tokenize/scala/ScalaUsageTest.scala")), StandardCharsets.UTF_8)
    val from = source.indexOf("// @start region=\"scala\"\n")
    val to = source.indexOf("    // @end region")
    assertTrue(from >= 0 && to > from, "region markers not found")
    val region = source.substring(from + "// @start region=\"scala\"\n".length, to)
    val guide = new String(Files.readAllBytes(Paths.get("../docs/guide.md")), StandardCharsets.UTF_8)
    val lines = region.linesIterator.map(_.trim).filter(_.nonEmpty).toSeq
    assertTrue(lines.size > 10, "region too short")
    for (line <- lines) {
      assertTrue(guide.contains(line), s"docs/guide.md lacks the Scala example line: $line")
    }
    // and the guide's only Scala block is exactly this region
    val blocks = "(?s)```scala\\n(.*?)```".r.findAllMatchIn(guide).map(_.group(1)).toSeq
    assertEquals(1, blocks.size, "Scala blocks in docs/guide.md")
    assertEquals(lines.asJava, blocks.head.linesIterator.map(_.trim).filter(_.nonEmpty).toSeq.asJava)
  }
}
