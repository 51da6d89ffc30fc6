package dev.morsel.tokenize.kotlin

import dev.morsel.tokenize.Decoding
import dev.morsel.tokenize.Pipeline
import dev.morsel.tokenize.Side
import dev.morsel.tokenize.Tokenizers
import dev.morsel.tokenize.Tokens
import dev.morsel.tokenize.Trust
import dev.morsel.tokenize.bpe.BpeLearner
import dev.morsel.tokenize.train.PieceCounter
import java.nio.file.Files
import java.nio.file.Paths
import java.text.Normalizer
import org.junit.jupiter.api.Assertions.assertEquals
import org.junit.jupiter.api.Assertions.assertFalse
import org.junit.jupiter.api.Assertions.assertNull
import org.junit.jupiter.api.Assertions.assertTrue
import org.junit.jupiter.api.Test

/**
 * Morsel from Kotlin, written the way a Kotlin service would use it: Kotlin lists straight into the
 * API, lambdas over token indices, no try/catch for checked exceptions (the API declares none).
 * The region between the markers is shown in docs/guide.md; the last test checks the guide still
 * holds every line of it.
 */
class KotlinUsageTest {

  /** Our own invented passenger messages for a fictional regional ferry operator. */
  private val messages = listOf(
    "Is the 18:05 sailing to Skarvøy full tonight?",
    "My bicycle ticket for the Skarvøy ferry was charged twice.",
    "Can I bring a kayak on the morning ferry to Tarnholm?",
    "The ferry to Tarnholm left without the cars from lane three.",
    "Is there a café on board the evening sailing?",
    "Which pier does the Skarvøy ferry leave from on Sundays?",
    "My dog and I missed the 07:40 sailing; can we take the next ferry?",
    "Will the sailing to Tarnholm run if the wind is this strong?",
    "The ticket machine at the pier only takes cards.",
    "Cabin 12 on the night ferry has no blankets.",
  )

  @Test
  fun trainEncodePadAndDecodeTheKotlinWay() {
    // @start region="kotlin"
    val pipeline = Pipeline.defaults()
    val counts = PieceCounter.builder().pipeline(pipeline).build().count(messages)
    val tokenizer = BpeLearner.builder()
        .vocabularySize(400)
        .reservedTokens(listOf("⟦slack⟧", "⟦crew⟧"))
        .build()
        .train(counts) // a tokenizer bound to the counted pipeline
    assertEquals(pipeline, tokenizer.pipeline())

    val text = "Is the 18:05 sailing to Skarvøy full?"
    val tokens = tokenizer.encode(text)
    val pieces = (0 until tokens.size()).map { i -> text.substring(tokens.start(i), tokens.end(i)) }

    val slack = tokenizer.reservedTokens().id("⟦slack⟧")
    val batch = Tokens.padBatch(tokenizer.encodeAll(listOf(text, "Cabin 12?")), slack, Side.END)
    val masks = batch.map { it.nonPaddingMask() }

    val back = tokenizer.decode(tokens.ids())
    // @end region="kotlin"

    // java.text.Normalizer is the independent reference for what the default pipeline (NFC) keeps
    assertEquals(Normalizer.normalize(text, Normalizer.Form.NFC), back)
    assertEquals(text, back)
    // offsets: monotone, inside the text, and the pieces cover the text once, in order
    for (i in 0 until tokens.size()) {
      assertTrue(tokens.start(i) <= tokens.end(i), "span $i")
      if (i > 0) assertTrue(tokens.start(i) >= tokens.end(i - 1), "span $i overlaps span ${i - 1}")
    }
    assertEquals(text, pieces.joinToString(""))
    assertTrue(tokens.size() < text.length, "training merged nothing: ${tokens.size()} tokens")

    // padding: same length, padding only at the end of the shorter text, masked out
    assertEquals(2, batch.size)
    assertEquals(batch[0].size(), batch[1].size())
    assertEquals(tokens, batch[0])
    val short = batch[1]
    val shortLength = tokenizer.encode("Cabin 12?").size()
    for (i in 0 until short.size()) {
      assertEquals(i >= shortLength, short.isPadding(i), "padding flag at $i")
      assertEquals(if (i >= shortLength) 0 else 1, masks[1][i], "mask at $i")
      if (i >= shortLength) assertEquals(slack, short.id(i))
    }
    assertEquals("Cabin 12?", tokenizer.decode(short.ids(), true, Decoding.REPLACE))
  }

  @Test
  fun reservedSpellingsInUntrustedTextStayText() {
    val tokenizer = BpeLearner.builder().vocabularySize(300).reservedTokens(listOf("⟦slack⟧", "⟦crew⟧")).build()
        .train(PieceCounter.builder().build().count(messages))
    val typed = "please page ⟦crew⟧ now"
    val untrusted = tokenizer.encode(typed)
    assertFalse((0 until untrusted.size()).any { untrusted.isReserved(it) }, "a passenger injected a reserved token")
    val trusted = tokenizer.encode(typed, Trust.TRUSTED)
    val crew = tokenizer.reservedTokens().id("⟦crew⟧")
    assertEquals(listOf(crew), (0 until trusted.size()).filter { trusted.isReserved(it) }.map { trusted.id(it) })
    // Java returns null for "no such reserved id": Kotlin sees a platform type, so a Kotlin caller types it as String?
    val missing: String? = tokenizer.reservedTokens().spelling(9999)
    assertNull(missing)
  }

  @Test
  fun streamDecodingFromASequenceOfIds() {
    val tokenizer = BpeLearner.builder().vocabularySize(350).build()
        .train(PieceCounter.builder().build().count(messages))
    val text = "Skarvøy → Tarnholm, café ☕"
    val decoder = tokenizer.streamDecoder(false, Decoding.STRICT)
    val streamed = buildString {
      tokenizer.encode(text).ids().forEach { append(decoder.accept(it)) }
      append(decoder.flush())
    }
    assertEquals(text, streamed)
  }

  @Test
  fun guideShowsTheKotlinRegion() {
    val source = String(Files.readAllBytes(
        Paths.get("src/test/kotlin/dev/morsel/tokenize/kotlin/KotlinUsageTest.kt")), Charsets.UTF_8)
    val region = source.substringAfter("// @start region=\"kotlin\"\n").substringBefore("    // @end region")
    val guide = String(Files.readAllBytes(Paths.get("../docs/guide.md")), Charsets.UTF_8)
    val lines = region.lines().map { it.trim() }.filter { it.isNotEmpty() }
    assertTrue(lines.size > 10, "region markers not found")
    for (line in lines) {
      assertTrue(guide.contains(line), "docs/guide.md lacks the Kotlin example line: $line")
    }
    // and the guide's only Kotlin block is exactly this region
    val blocks = Regex("```kotlin\\n(.*?)```", RegexOption.DOT_MATCHES_ALL).findAll(guide).map { it.groupValues[1] }.toList()
    assertEquals(1, blocks.size, "Kotlin blocks in docs/guide.md")
    assertEquals(lines, blocks[0].lines().map { it.trim() }.filter { it.isNotEmpty() })
  }
}
